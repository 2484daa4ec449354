import { deliveryNotePdf } from '../../../services/delivery-pdf'
// The delivery note as a PDF: signed once the delivery is, blank lines for the driver before.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead', 'finisher')
  const { id } = validParams(event, idParamSchema)
  const { filename, pdf } = await deliveryNotePdf(actor, id)
  setResponseHeaders(event, { 'content-type': 'application/pdf', 'content-disposition': `inline; filename="${filename}"`, 'cache-control': 'private, no-store' })
  return pdf
})
