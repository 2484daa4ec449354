// A quote revision as the client receives it: a PDF with the workshop's name, the lines with
// their unit prices (margin included), the totals with tax, the deposit asked, and the usual
// caution when the work includes fixing on site. The shop's own estimate never appears here.
import { workshopsRepo } from '../repos/workshops'
import { quotesRepo } from '../repos/quotes'
import { quoteNumber } from './quotes'
import { renderPdf, pdfHeader, pdfTable, PDF_COLOURS } from '../utils/pdf'
import { formatMoney } from '#shared/utils/money'
import { formatUnits } from '#shared/utils/units-display'
import { formatDay } from '#shared/utils/workshop-format'
import type { QuoteLine } from '#shared/utils/quote-pricing'

export const FIXING_CAUTION = 'Heavy castings fixed overhead must be fixed by competent people to a method suited to the '
  + 'building, following local building codes. The weights we give are for planning; we do not design fixings.'

export async function quotePdf(workshopId: number, id: number, revision?: number): Promise<{ filename: string; pdf: Buffer }> {
  const db = useDb()
  const [ws, quote, revisions] = await Promise.all([workshopsRepo.get(db, workshopId), quotesRepo.byId(db, workshopId, id), quotesRepo.revisions(db, workshopId, id)])
  if (!ws || !quote) notFound('Quote')
  const rev = revision === undefined ? revisions.at(-1) : revisions.find(r => r.revision === revision)
  if (!rev) notFound('Quote revision')
  const number = quoteNumber(quote.number)
  const money = (minor: number) => formatMoney(minor, rev.currency)
  const lines = rev.lines as QuoteLine[]
  const qty = (l: QuoteLine) => (l.unit === 'm' ? formatUnits.length(l.quantity, ws.units, 2) : `${l.quantity} ${l.unit}${l.quantity === 1 ? '' : 's'}`)
  const pdf = await renderPdf({ title: `${number} revision ${rev.revision}`, author: ws.name }, (doc) => {
    const day = formatDay(rev.sent_at ?? rev.created_at, ws.timezone)
    pdfHeader(doc, ws.name, `Quote ${number}, revision ${rev.revision}`, `${quote.title} · for ${quote.client_name ?? 'client to be named'} · ${day}`)
    if (rev.status === 'draft') doc.font('Helvetica-Bold').fontSize(10).fillColor(PDF_COLOURS.kiln).text('DRAFT: not yet sent; prices may change.').moveDown(0.5)
    pdfTable(doc, [
      { label: 'Item', width: 52 }, { label: 'Quantity', width: 16, align: 'right' },
      { label: 'Unit price', width: 16, align: 'right' }, { label: 'Amount', width: 16, align: 'right' },
    ], lines.map(l => [l.description, qty(l), money(l.unitPrice), money(l.amount)]))
    doc.moveDown(0.5).font('Helvetica').fontSize(10).fillColor(PDF_COLOURS.ink)
    const total = (label: string, value: string, bold = false) => doc.font(bold ? 'Helvetica-Bold' : 'Helvetica').text(`${label}  ${value}`, { align: 'right' })
    total('Net', money(rev.net))
    total('Tax', money(rev.tax))
    total('Total', money(rev.total), true)
    if (rev.deposit > 0) total('Deposit asked before moulds are started', money(rev.deposit))
    doc.moveDown(1).font('Helvetica').fontSize(9).fillColor(PDF_COLOURS.muted)
      .text('Prices are fixed for this revision. Any change to the work is quoted as a new revision.')
    if (lines.some(l => l.kind === 'fixing')) doc.moveDown(0.5).text(FIXING_CAUTION)
  })
  return { filename: `${number}-r${rev.revision}.pdf`, pdf }
}
