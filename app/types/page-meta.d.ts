import type { Role } from '#shared/types/auth'

declare module '#app' {
  interface PageMeta {
    /** Roles that may open the page; absent means any signed-in user. */
    roles?: Role[]
    /** Pages anyone may open signed out (sign-in, links from e-mails, cautions). */
    public?: boolean
    /** Pages that use the full width of the window (the board). */
    wide?: boolean
  }
}

export {}
