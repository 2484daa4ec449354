import { clientQuote } from '../../../../services/quotes'
import { quotePdf } from '../../../../services/quote-pdf'
// The client's quote as a PDF: the latest revision sent to them.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'client')
  const { id } = validParams(event, idParamSchema)
  const { revision } = await clientQuote(actor, id)
  const { filename, pdf } = await quotePdf(actor.workshopId, id, revision)
  setResponseHeaders(event, { 'content-type': 'application/pdf', 'content-disposition': `inline; filename="${filename}"`, 'cache-control': 'private, no-store' })
  return pdf
})
