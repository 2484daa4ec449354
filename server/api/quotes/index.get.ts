import { listQuotes } from '../../services/quotes'
// The workshop's quotes, newest first, each with its latest revision's status and total (lead).
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  return listQuotes(actor.workshopId)
})
