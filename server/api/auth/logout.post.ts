// Ends the session here. `next` is where this device goes now: a shared tablet back to its
// person picker, anything else to sign-in (the device cookie is httpOnly, so the page cannot tell).
export default defineEventHandler(async (event) => {
  await endSession(event)
  const onTablet = await liveTablet(getCookie(event, TABLET_COOKIE))
  return { ok: true, next: onTablet ? '/tablet' : '/login' }
})
