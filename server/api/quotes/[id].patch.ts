import { updateQuote } from '../../services/quotes'
// Edit a quote's title or client, or its draft revision's take-off (lead); a sent revision is refused.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  const { id } = validParams(event, idParamSchema)
  const { version, ...input } = await validBody(event, quotePatchSchema)
  return updateQuote(actor.workshopId, id, version, input)
})
