import { confirmPasswordReset } from '../../../services/accounts'
// Sets a new password from a reset link; every earlier session of the user ends.
export default defineEventHandler(async (event) => {
  const input = await validBody(event, resetConfirmSchema)
  const user = await confirmPasswordReset(event, input)
  if (!user) throw createError({ statusCode: 410, message: 'This reset link is no longer valid' })
  await clearAttempts('loginAccount', user.email.toLowerCase())
  await endUserSessions(user.workshop_id, user.id)
  await startSession(event, user)
  return { id: user.id, name: user.name, role: user.role, home: ROLE_HOME[user.role] }
})
