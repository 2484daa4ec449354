// The signed delivery note as a PDF (renderPdf, server/utils/pdf.ts): the job, client and site,
// the day and vehicle, every piece by crate with its weight and its condition on arrival, the
// receiver's name and signature and when it was signed. A booked delivery prints the same note
// with the signature left blank, for the driver's paper copy.
import type { Actor } from '../utils/auth'
import { formatDateTime, formatDay, formatNumber, workshopLocale } from '#shared/utils/workshop-format'
import { deliveryForNote, crateLabel } from './deliveries'

export async function deliveryNotePdf(actor: Actor, id: number): Promise<{ filename: string; pdf: Buffer }> {
  const { delivery: d, workshop: ws, client, signature, noteNo } = await deliveryForNote(actor, id)
  const locale = workshopLocale(ws.locale)
  const day = (s: string) => formatDay(`${s}T12:00:00Z`, 'UTC', locale)
  const kg = (n: number) => `${formatNumber(n, 1, locale)} kg`
  const pdf = await renderPdf({ title: `Delivery note ${d.job.code}`, author: ws.name }, (doc) => {
    pdfHeader(doc, ws.name, `Delivery note: ${d.job.code} ${d.job.title}`, noteNo ? `Dispatch note ${noteNo}` : undefined)
    doc.font('Helvetica').fontSize(10).fillColor(PDF_COLOURS.ink)
    if (client) doc.text(`Client: ${client}`)
    if (d.site) doc.text(`Site: ${d.site.name}, ${d.site.address}${d.site.postcode ? `, ${d.site.postcode}` : ''}`)
    doc.text(`Delivery day: ${day(d.deliveryDay)}`)
    doc.text(`Vehicle: ${d.vehicle}`)
    doc.moveDown(0.5)
    pdfTable(doc, [
      { label: 'Crate', width: 12 }, { label: 'Mark', width: 22 }, { label: 'Item', width: 36 }, { label: 'Weight', width: 14, align: 'right' }, { label: 'On arrival', width: 30 },
    ], d.pieces.map(p => [
      p.crateNo === null ? 'loose' : crateLabel(p.crateNo), p.mark, p.item ?? '', kg(p.kg),
      p.broken ? `Broken${p.brokenNote ? `: ${p.brokenNote}` : ''}` : (d.state === 'delivered' ? 'Received' : ''),
    ]))
    doc.moveDown(0.5).font('Helvetica-Bold').text(`${d.pieces.length} pieces, ${kg(d.totalKg)} in all`)
    doc.font('Helvetica').fontSize(9).fillColor(PDF_COLOURS.muted)
      .text(`Pieces over ${d.teamLiftKg} kg need two people or a lifting aid. Unload and lift as your site's competent person and local rules direct.`)
    doc.moveDown(1).fontSize(10).fillColor(PDF_COLOURS.ink)
    if (d.state === 'delivered') {
      doc.text(`Received by: ${d.receiverName}`)
      doc.text(`Signed: ${formatDateTime(d.deliveredAt!, ws.timezone, locale)}`)
      if (signature) {
        try {
          doc.image(signature, { fit: [220, 90] })
        }
        catch {
          // a PNG the pad wrote but PDFKit cannot read: the name and time still stand as signed
          doc.text('(the signature image could not be drawn)')
        }
      }
    }
    else {
      doc.text('Received by: ______________________________')
      doc.moveDown(1).text('Signature: ______________________________')
    }
  })
  return { filename: `delivery-${d.job.code}-${d.id}.pdf`.replace(/[^\w.-]/g, '_'), pdf }
}
