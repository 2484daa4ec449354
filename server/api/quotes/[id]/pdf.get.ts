import { quotePdf } from '../../../services/quote-pdf'
// A quote revision as a PDF (lead): the latest, or ?revision=N.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  const { id } = validParams(event, idParamSchema)
  const { revision } = validQuery(event, quotePdfQuerySchema)
  const { filename, pdf } = await quotePdf(actor.workshopId, id, revision)
  setResponseHeaders(event, { 'content-type': 'application/pdf', 'content-disposition': `inline; filename="${filename}"`, 'cache-control': 'private, no-store' })
  return pdf
})
