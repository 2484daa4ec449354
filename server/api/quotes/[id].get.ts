import { getQuote } from '../../services/quotes'
// A quote with every revision (lead).
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  const { id } = validParams(event, idParamSchema)
  return getQuote(actor.workshopId, id)
})
