import { createQuote } from '../../services/quotes'
// A new quote from a take-off, priced at the workshop's rates as revision 1, a draft (lead).
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  const input = await validBody(event, quoteCreateSchema)
  const quote = await createQuote(actor.workshopId, input)
  setResponseStatus(event, 201)
  return quote
})
