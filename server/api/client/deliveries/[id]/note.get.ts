import { deliveryNotePdf } from '../../../../services/delivery-pdf'
// A client member's signed delivery note as a PDF; anyone else's is a 404.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'client')
  const { id } = validParams(event, idParamSchema)
  const { filename, pdf } = await deliveryNotePdf(actor, id)
  setResponseHeaders(event, { 'content-type': 'application/pdf', 'content-disposition': `inline; filename="${filename}"`, 'cache-control': 'private, no-store' })
  return pdf
})
