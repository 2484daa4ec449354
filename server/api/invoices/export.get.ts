// The workshop's invoices as CSV for the shop's accounts (lead), through the shared sender
// (server/utils/csv.ts: formula escaping, BOM). Money as a decimal in the workshop's currency,
// each money header naming it (net_GBP); days in the workshop's zone.
import { invoicesRepo } from '../../repos/invoices'
import { ratesRepo } from '../../repos/rates'
import { workshopsRepo } from '../../repos/workshops'
import { invoiceNumber } from '../../services/invoices'
import { minorDigits } from '#shared/utils/money'
import { dayIn } from '#shared/utils/workshop-format'

/** Minor units as a plain decimal of the currency ("1895.84"), exact: no float on the way. */
function decimal(minor: number, digits: number): string {
  if (!digits) return String(minor)
  const s = String(Math.abs(minor)).padStart(digits + 1, '0')
  return `${minor < 0 ? '-' : ''}${s.slice(0, -digits)}.${s.slice(-digits)}`
}

export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  const db = useDb()
  const [{ currency }, ws] = await Promise.all([ratesRepo.get(db, actor.workshopId), workshopsRepo.get(db, actor.workshopId)])
  const zone = ws?.timezone ?? 'UTC'
  const money = ['net', 'tax', 'total', 'deposit_credit', 'amount_due'] as const
  const columns = [
    { key: 'invoice', header: 'invoice' }, { key: 'issued_on', header: 'issued_on' }, { key: 'job', header: 'job' }, { key: 'client', header: 'client' },
    { key: 'for', header: 'for' }, { key: 'status', header: 'status' }, { key: 'currency', header: 'currency' },
    ...money.map(k => ({ key: k, header: `${k}_${currency}`, number: true })), { key: 'void_reason', header: 'void_reason' },
  ]
  const rows = (await invoicesRepo.exportQuery(db, actor.workshopId)).map(r => ({
    invoice: invoiceNumber(r.number), issued_on: dayIn(r.issued_at, zone), job: r.job_code, client: r.client ?? '',
    for: r.note_no ? `dispatch note ${r.note_no}` : r.stage, status: r.status, currency: r.currency,
    ...Object.fromEntries(money.map(k => [k, decimal(Number(r[k]), minorDigits(r.currency))])), void_reason: r.void_reason ?? '',
  }))
  return sendCsvRows(event, 'setline-invoices.csv', rows, columns)
})
