import { usersRepo } from '../../repos/users'
// Sign-in with e-mail and password; failures are counted per account and per address.
export default defineEventHandler(async (event) => {
  const { email, password } = await validBody(event, loginSchema)
  const address = clientAddress(event)
  await assertNotLimited('loginAccount', email, event)
  await assertNotLimited('loginAddress', address, event)
  const user = await usersRepo.byEmail(useDb(), email)
  const ok = await verifyOrBurn(user?.password_hash, password)
  if (!user || !ok || user.disabled_at) {
    await spendAttempt('loginAccount', email, event)
    await spendAttempt('loginAddress', address, event)
    // a disabled account gets the wrong password's answer: telling them apart would confirm
    // the password to whoever typed it (OWASP Authentication Cheat Sheet, error messages)
    throw createError({ statusCode: 401, message: 'E-mail or password is wrong' })
  }
  await clearAttempts('loginAccount', email)
  await startSession(event, user)
  return { id: user.id, name: user.name, role: user.role, home: ROLE_HOME[user.role] }
})
