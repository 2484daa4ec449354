import { leadInvoicePdf } from '../../../services/invoices'
// One invoice as a PDF (lead).
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  const { id } = validParams(event, idParamSchema)
  const { filename, pdf } = await leadInvoicePdf(actor.workshopId, id)
  setResponseHeaders(event, { 'content-type': 'application/pdf', 'content-disposition': `inline; filename="${filename}"`, 'cache-control': 'private, no-store' })
  return pdf
})
