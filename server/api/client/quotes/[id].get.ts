import { clientQuote } from '../../../services/quotes'
// A quote sent to the client's organisation: its latest sent revision as the client reads it.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'client')
  const { id } = validParams(event, idParamSchema)
  return clientQuote(actor, id)
})
