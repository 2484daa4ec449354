// The user kept in the sealed session cookie (nuxt-auth-utils).
export const ROLES = ['lead', 'caster', 'finisher', 'client'] as const
export type Role = (typeof ROLES)[number]

export interface SessionUserData {
  id: number
  workshopId: number
  role: Role
  name: string
  email: string
  /** users.session_version when the session began; a mismatch ends the session. */
  sv: number
  /** Set when the person switched in with their PIN on a shared tablet (server/utils/tablet.ts). */
  tablet?: { id: number; name: string }
}

/** Where each role lands after sign-in. */
export const ROLE_HOME: Record<Role, string> = {
  lead: '/lead',
  caster: '/floor',
  finisher: '/finishing',
  client: '/client',
}

/** GET /api/auth/invitation: what an invitation link is for, so the accept page can greet the person. */
export interface InvitationInfoDto { email: string; name: string | null; role: Role; workshop: string }
