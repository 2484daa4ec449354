// What the people routes send (camelCase on the wire): the workshop's people and pending invitations.
import type { Role } from './auth'

/** A person as PATCH /api/users/[id] answers (never a hash or session field). */
export interface Person {
  id: number
  email: string
  name: string
  role: Role
  clientOrgId: number | null
  disabledAt: string | null
  createdAt: string
}

/** GET /api/users: the workshop's people, with whether each has a tablet PIN (never the hash). */
export type PersonListEntry = Person & { hasPin: boolean }

/** An invitation as GET /api/invitations lists it and POST /api/invitations answers. */
export interface Invitation {
  id: number
  email: string
  name: string | null
  role: Role
  clientOrgId: number | null
  jobId: number | null
  expiresAt: string
  createdAt: string
}
