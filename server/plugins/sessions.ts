// Every clear of the session cookie ends its server-side record too (server/utils/auth.ts):
// our sign-out route and nuxt-auth-utils' built-in DELETE /api/_auth/session alike.
import type { SealedSession } from '../utils/auth'

export default defineNitroPlugin(() => {
  sessionHooks.hook('clear', async (session) => {
    await endSessionRecord(session as SealedSession)
  })
})
