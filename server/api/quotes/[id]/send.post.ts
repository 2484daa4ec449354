import { sendQuote } from '../../../services/quotes'
// Send the draft revision to the client: from now on it is frozen (lead).
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  const { id } = validParams(event, idParamSchema)
  const { version } = await validBody(event, quoteVersionedSchema)
  return sendQuote(actor.workshopId, id, version, actor.id)
})
