// The session user as the pages see it (nuxt-auth-utils). Kept in app/ because the
// shared type project cannot resolve #auth-utils; the server reads it as Actor.
import type { SessionUserData } from '#shared/types/auth'

declare module '#auth-utils' {
  // eslint-disable-next-line @typescript-eslint/no-empty-object-type
  interface User extends SessionUserData {}
}

export {}
