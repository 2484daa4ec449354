import { clientInvoicePdf } from '../../../../services/invoices'
// An invoice of the client's own job as a PDF (client); any other is a 404.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'client')
  const { id } = validParams(event, idParamSchema)
  const { filename, pdf } = await clientInvoicePdf(actor, id)
  setResponseHeaders(event, { 'content-type': 'application/pdf', 'content-disposition': `inline; filename="${filename}"`, 'cache-control': 'private, no-store' })
  return pdf
})
