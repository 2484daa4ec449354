import { inviteUser } from '../../services/accounts'
import { toInvitation } from '../../services/people'
// Invite a person into the workshop with a role (lead). The link goes out by e-mail.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  const input = await validBody(event, inviteSchema)
  const invitation = await inviteUser(actor, input)
  setResponseStatus(event, 201)
  return toInvitation(invitation)
})
