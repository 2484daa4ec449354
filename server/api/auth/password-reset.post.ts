import { requestPasswordReset } from '../../services/accounts'
// Asks for a reset link by e-mail; the same answer whether or not the account exists.
export default defineEventHandler(async (event) => {
  const { email } = await validBody(event, resetRequestSchema)
  await spendAttempt('resetAddress', clientAddress(event), event)
  await requestPasswordReset(email)
  return { ok: true, message: 'If that address has a Setline account, a reset link is on its way.' }
})
