import { decideQuote } from '../../../../services/quotes'
// The client accepts the revision they read, or asks for changes with a comment; the leads are mailed.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'client')
  const { id } = validParams(event, idParamSchema)
  const input = await validBody(event, quoteDecisionSchema)
  return decideQuote(actor, id, input)
})
