import { pendingInvitations } from '../../services/people'
// Invitations not yet accepted (lead).
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  return pendingInvitations(actor.workshopId)
})
