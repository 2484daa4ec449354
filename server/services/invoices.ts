// Invoices for a job: per stage or per dispatch note, numbered per workshop (INV-0001), lines at
// the lead's unit prices, tax at the workshop's rate on the sum (money.ts: exact, rounded once),
// and the deposit paid credited once across the job's invoices. Issued is final: a mistake is
// voided with its reason and a new invoice issued. The client's people see their jobs' invoices;
// the job's client contacts with invoice mail on are mailed the PDF when it is issued (notify.ts),
// and a void mails nothing.
import type { Knex } from 'knex'
import type { Actor } from '../utils/auth'
import { invoicesRepo, type InvoiceRow } from '../repos/invoices'
import { jobsRepo } from '../repos/jobs'
import { ratesRepo } from '../repos/rates'
import { paymentsRepo } from '../repos/payments'
import { dispatchesRepo } from '../repos/dispatches'
import { recordEvent } from '../repos/events'
import { notifyInvoiceIssued } from './notify'
import { isoOrNull } from './catalogue'
import { workshopsRepo } from '../repos/workshops'
import { renderPdf, pdfHeader, pdfTable, PDF_COLOURS } from '../utils/pdf'
import { formatDay } from '#shared/utils/workshop-format'
import { formatMoney, lineAmount, shareOf } from '#shared/utils/money'
import type { DispatchInvoiceLines, Invoice } from '#shared/types/invoices'
import { invoiceLinesFromDispatch } from '#shared/utils/invoice-lines'

export const invoiceNumber = (n: number) => `INV-${String(n).padStart(4, '0')}`

export function toInvoice(r: InvoiceRow): Invoice {
  return {
    id: r.id, number: invoiceNumber(r.number), jobId: r.job_id, jobCode: r.job_code, dispatchId: r.dispatch_id, dispatchNote: r.note_no,
    stage: r.stage, status: r.status, lines: r.lines, currency: r.currency, net: r.net, tax: r.tax, total: r.total,
    depositCredit: r.deposit_credit, amountDue: r.amount_due, voidReason: r.void_reason, issuedAt: r.issued_at.toISOString(), voidedAt: isoOrNull(r.voided_at),
  }
}

/** What the invoice is for, in the words of its PDF and mail. */
const invoiceFor = (row: InvoiceRow) => (row.note_no ? `dispatch note ${row.note_no}` : row.stage ?? 'the job')

export async function listInvoices(workshopId: number): Promise<Invoice[]> {
  return (await invoicesRepo.list(useDb(), workshopId)).map(toInvoice)
}

export async function getInvoice(workshopId: number, id: number): Promise<Invoice> {
  const row = await invoicesRepo.byId(useDb(), workshopId, id)
  if (!row) notFound('Invoice')
  return toInvoice(row)
}

/** A dispatch note's pieces as invoice lines priced from their items (shared/utils/invoice-lines.ts); another workshop's note is a 404. */
export async function dispatchInvoiceLines(workshopId: number, dispatchId: number): Promise<DispatchInvoiceLines> {
  const db = useDb()
  const note = await dispatchesRepo.byId(db, workshopId, dispatchId)
  if (!note) notFound('Dispatch note')
  const [pieces, rates] = await Promise.all([dispatchesRepo.invoicePieces(db, workshopId, dispatchId), ratesRepo.get(db, workshopId)])
  const lines = invoiceLinesFromDispatch(pieces.map(p => ({
    mark: p.mark, itemId: p.item_id, itemDescription: p.item_description, itemPieces: p.pieces_needed, itemPriceMinor: p.price_minor, mouldCode: p.mould_code,
  })))
  return { dispatchId, noteNo: note.note_no, jobId: note.job_id, currency: rates.currency, lines }
}

export async function issueInvoice(actor: Actor, jobId: number, input: { dispatchId?: number | null; stage?: string | null; lines: { description: string; quantity: number; unitPrice: number }[] }): Promise<Invoice> {
  const ws = actor.workshopId
  return useDb().transaction(async (trx) => {
    if (!(await jobsRepo.byId(trx, ws, jobId))) notFound('Job')
    if (input.dispatchId) {
      const note = await dispatchesRepo.byId(trx, ws, input.dispatchId)
      if (!note || Number(note.job_id) !== jobId) unprocessable([{ field: 'dispatchId', message: 'Dispatch note is not one of this job\'s' }])
    }
    const rates = await ratesRepo.get(trx, ws)
    const lines = input.lines.map((l, i) => ({ ...l, amount: lineAmount(l.quantity, l.unitPrice, `lines.${i}.quantity`) }))
    const net = lines.reduce((a, l) => a + l.amount, 0)
    const tax = shareOf(net, rates.tax_bp, 'tax')
    const total = net + tax
    // the deposit paid is credited once: what the job's earlier issued invoices have not taken
    await invoicesRepo.lockNumbers(trx, ws)
    const available = Math.max(0, (await paymentsRepo.paidDeposit(trx, ws, jobId)) - (await invoicesRepo.depositCredited(trx, ws, jobId)))
    const credit = Math.min(available, total)
    const id = await invoicesRepo.insert(trx, {
      workshop_id: ws, job_id: jobId, dispatch_id: input.dispatchId ?? null, stage: input.stage ?? null, lines, currency: rates.currency,
      net, tax, total, deposit_credit: credit, amount_due: total - credit, issued_by: actor.id,
    })
    await recordEvent(trx, { workshopId: ws, entity: 'job', entityId: jobId, type: 'invoice.issued', actorId: actor.id, data: { invoiceId: id, total, depositCredit: credit } })
    const row = (await invoicesRepo.byId(trx, ws, id))!
    // the client's contacts with invoice mail on get it with its PDF, queued in this transaction
    await notifyInvoiceIssued(trx, ws, {
      id, number: invoiceNumber(row.number), jobId, what: invoiceFor(row), total: formatMoney(total, rates.currency),
      amountDue: formatMoney(row.amount_due, rates.currency), pdf: await invoicePdf(ws, row, trx),
    })
    return toInvoice(row)
  })
}

/** Voids an issued invoice with its reason; its deposit credit is free for the next invoice. */
export async function voidInvoice(actor: Actor, id: number, reason: string): Promise<Invoice> {
  const ws = actor.workshopId
  return useDb().transaction(async (trx) => {
    const row = await invoicesRepo.byId(trx, ws, id)
    if (!row) notFound('Invoice')
    if (!(await invoicesRepo.void(trx, ws, id, reason))) conflict(`Invoice ${invoiceNumber(row.number)} is already void`)
    await recordEvent(trx, { workshopId: ws, entity: 'job', entityId: row.job_id, type: 'invoice.void', actorId: actor.id, data: { invoiceId: id, reason } })
    return toInvoice((await invoicesRepo.byId(trx, ws, id))!)
  })
}

export async function clientInvoices(actor: Actor): Promise<Invoice[]> {
  return (await invoicesRepo.forClient(useDb(), actor.workshopId, actor.id)).map(toInvoice)
}

/** The invoice as a PDF: the workshop's name, lines, tax, the deposit credited and what is due. */
export async function invoicePdf(workshopId: number, row: InvoiceRow, db: Knex = useDb()): Promise<{ filename: string; pdf: Buffer }> {
  const ws = await workshopsRepo.get(db, workshopId)
  if (!ws) notFound('Invoice')
  const number = invoiceNumber(row.number)
  const money = (minor: number) => formatMoney(minor, row.currency)
  const pdf = await renderPdf({ title: `Invoice ${number}`, author: ws.name }, (doc) => {
    const what = invoiceFor(row)
    pdfHeader(doc, ws.name, `Invoice ${number}`, `Job ${row.job_code} · ${what} · ${formatDay(row.issued_at, ws.timezone)}`)
    if (row.status === 'void') doc.font('Helvetica-Bold').fontSize(10).fillColor(PDF_COLOURS.kiln).text(`VOID: ${row.void_reason}`).moveDown(0.5)
    pdfTable(doc, [
      { label: 'Item', width: 52 }, { label: 'Quantity', width: 16, align: 'right' },
      { label: 'Unit price', width: 16, align: 'right' }, { label: 'Amount', width: 16, align: 'right' },
    ], row.lines.map(l => [l.description, String(l.quantity), money(l.unitPrice), money(l.amount)]))
    doc.moveDown(0.5).font('Helvetica').fontSize(10).fillColor(PDF_COLOURS.ink)
    const total = (label: string, value: string, bold = false) => doc.font(bold ? 'Helvetica-Bold' : 'Helvetica').text(`${label}  ${value}`, { align: 'right' })
    total('Net', money(row.net))
    total('Tax', money(row.tax))
    total('Total', money(row.total), true)
    if (row.deposit_credit > 0) total('Deposit paid, credited', `-${money(row.deposit_credit)}`)
    total('Amount due', money(row.amount_due), true)
  })
  return { filename: `${number}.pdf`, pdf }
}

export async function leadInvoicePdf(workshopId: number, id: number) {
  const row = await invoicesRepo.byId(useDb(), workshopId, id)
  if (!row) notFound('Invoice')
  return invoicePdf(workshopId, row)
}

/** A client's invoice as a PDF: only of a job they are a member of (else the same 404). */
export async function clientInvoicePdf(actor: Actor, id: number) {
  const row = (await invoicesRepo.forClient(useDb(), actor.workshopId, actor.id)).find(r => r.id === id)
  if (!row) notFound('Invoice')
  return invoicePdf(actor.workshopId, row)
}
