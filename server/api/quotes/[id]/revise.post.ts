import { reviseQuote } from '../../../services/quotes'
// Start the next revision from the latest sent one, repriced at today's rates (lead).
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  const { id } = validParams(event, idParamSchema)
  const { version } = await validBody(event, quoteVersionedSchema)
  return reviseQuote(actor.workshopId, id, version)
})
