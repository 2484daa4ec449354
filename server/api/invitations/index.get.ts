import { invitationsRepo } from '../../repos/invitations'
// Invitations not yet accepted (lead).
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  return invitationsRepo.pending(useDb(), actor.workshopId)
})
