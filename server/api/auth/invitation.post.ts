import { acceptInvitation } from '../../services/accounts'
// Accepts an invitation: creates the account, then signs the new user in.
export default defineEventHandler(async (event) => {
  const input = await validBody(event, acceptInviteSchema)
  const user = await acceptInvitation(event, input)
  await startSession(event, user)
  return { id: user.id, name: user.name, role: user.role, home: ROLE_HOME[user.role] }
})
