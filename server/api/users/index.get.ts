import { usersRepo } from '../../repos/users'
// The workshop's people (lead).
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  return usersRepo.list(useDb(), actor.workshopId)
})
