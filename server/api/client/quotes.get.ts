import { clientQuotes } from '../../services/quotes'
// The quotes sent to the client's organisation, each at its latest sent revision.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'client')
  return clientQuotes(actor)
})
