import { assertSetupOpen, ensureSetupCode } from '../../services/setup'
// Public, only while no workshop exists (404 after): tells the set-up page it may show its
// form, and prints a new code on the console when the last one expired.
export default defineEventHandler(async () => {
  await assertSetupOpen()
  const printed = await ensureSetupCode()
  return { open: true, newCodePrinted: printed }
})
