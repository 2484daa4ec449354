import { makeJobFromQuote } from '../../../services/quote-job'
// The accepted quote becomes a job with its items, its site and its deposit, in one step (lead).
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  const { id } = validParams(event, idParamSchema)
  const input = await validBody(event, quoteJobSchema)
  const made = await makeJobFromQuote(actor, id, input)
  setResponseStatus(event, 201)
  return made
})
