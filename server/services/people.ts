// The lead's people page: the workshop's people and pending invitations as their DTOs, and a
// person's role or disabled flag changed (either ends their sessions and live sockets at once).
import type { Actor } from '../utils/auth'
import { usersRepo, type PublicUserRow } from '../repos/users'
import { invitationsRepo, type InvitationRow } from '../repos/invitations'
import { setUserDisabled } from './accounts'
import type { Role } from '#shared/types/auth'
import type { Invitation, Person, PersonListEntry } from '#shared/types/people'

export function toPerson(r: PublicUserRow): Person {
  return {
    id: r.id, email: r.email, name: r.name, role: r.role, clientOrgId: r.client_org_id,
    disabledAt: r.disabled_at ? r.disabled_at.toISOString() : null, createdAt: r.created_at.toISOString(),
  }
}

export function toInvitation(r: InvitationRow): Invitation {
  return {
    id: r.id, email: r.email, name: r.name, role: r.role, clientOrgId: r.client_org_id, jobId: r.job_id,
    expiresAt: r.expires_at.toISOString(), createdAt: r.created_at.toISOString(),
  }
}

export async function listPeople(workshopId: number): Promise<PersonListEntry[]> {
  return (await usersRepo.list(useDb(), workshopId)).map(r => ({ ...toPerson(r), hasPin: r.has_pin }))
}

export async function pendingInvitations(workshopId: number): Promise<Invitation[]> {
  return (await invitationsRepo.pending(useDb(), workshopId)).map(toInvitation)
}

export async function changePerson(actor: Actor, id: number, input: { role?: Role; disabled?: boolean }): Promise<Person> {
  if (id === actor.id) unprocessable([{ field: 'id', message: 'you cannot disable yourself or change your own role' }])
  const db = useDb()
  if (!(await usersRepo.byId(db, actor.workshopId, id))) notFound('User')
  let row: PublicUserRow | undefined
  if (input.role !== undefined) row = await usersRepo.setRole(db, actor.workshopId, id, input.role)
  if (input.disabled !== undefined) row = await setUserDisabled(actor.workshopId, id, input.disabled)
  // the schema asks for one of the two: either change ends their sessions and live sockets now
  await endUserSessions(actor.workshopId, id)
  if (!row) notFound('User')
  return toPerson(row)
}
