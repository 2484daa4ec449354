import { listPeople } from '../../services/people'
// The workshop's people (lead).
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  return listPeople(actor.workshopId)
})
