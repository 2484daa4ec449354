// Shared tablets and PINs: a lead signs a device in as the workshop's
// tablet, casters and finishers set a PIN and switch in with it, a lead revokes a tablet.
//
// The device carries the httpOnly `setline-tablet` cookie (a random token; only its SHA-256 is
// stored; a year, set again on every switch). The tablet routes answer to that cookie
// (`requireTablet`), not to a session. A switch starts a normal session whose user carries
// `tablet: { id, name }`; requireRole and the socket end it when the request lacks that tablet's
// cookie or a lead revoked the tablet. Only casters and finishers switch in (TABLET_ROLES): leads
// use their password. Every refusal (unknown, other workshop, disabled, no PIN, wrong role,
// wrong PIN) is the same 401 and counts against `pinDevice`, and against `pinPerson` (keyed
// workshop:person) only for a person of the tablet's own workshop, so nobody outside a workshop
// can lock its people out. PINs are hashed like passwords. "Switch person" on the page tries
// once to send that person's waiting outbox steps, then switches: the rest wait for their owner.
import type { H3Event } from 'h3'
import type { Actor } from '../utils/auth'
import { liveRooms } from '#shared/types/live'
import { tabletsRepo } from '../repos/tablets'
import type { TabletDeviceDto, TabletPickerDto, TabletRevokedDto } from '#shared/types/tablets'
import { usersRepo } from '../repos/users'
import { workshopsRepo } from '../repos/workshops'
import { userSessionsRepo } from '../repos/user-sessions'

/**
 * Signs the device a lead is holding in as a shared tablet: a new tablet_devices row and a
 * fresh device token (returned once, for the cookie). When the device already carried a live
 * tablet cookie of this workshop, that older row is revoked in the same transaction, so one
 * device is never two tablets.
 */
export async function registerTablet(actor: Actor, name: string, oldToken: string | undefined) {
  const { token, hash } = newLinkToken()
  const old = await liveTablet(oldToken)
  const row = await useDb().transaction(async (trx) => {
    if (old && old.workshop_id === actor.workshopId) await tabletsRepo.revoke(trx, actor.workshopId, old.id)
    return tabletsRepo.insert(trx, { workshop_id: actor.workshopId, name, token_hash: hash, signed_in_by: actor.id })
  })
  return { row, token }
}

/** Revokes a tablet of the lead's workshop; whoever is switched in on it is signed out. */
/** The workshop's tablets, live ones first; `currentId` is the tablet the asking device is, if any. */
export async function listTablets(actor: Actor, currentId: number | undefined): Promise<TabletDeviceDto[]> {
  const rows = await tabletsRepo.list(useDb(), actor.workshopId)
  return rows.map(r => ({
    id: r.id, name: r.name, revokedAt: r.revoked_at?.toISOString() ?? null, createdAt: r.created_at.toISOString(),
    lastUsedAt: r.last_used_at.toISOString(), signedInByName: r.signed_in_by_name, current: r.id === currentId,
  }))
}

/** The picker a tablet shows: its name, its workshop's and the casters and finishers with a PIN. */
export async function tabletPicker(tablet: { id: number; name: string; workshop_id: number }): Promise<TabletPickerDto> {
  const db = useDb()
  const [workshop, people] = await Promise.all([workshopsRepo.get(db, tablet.workshop_id), usersRepo.tabletPeople(db, tablet.workshop_id, TABLET_ROLES)])
  if (!workshop) notFound('Workshop')
  return { tablet: { id: tablet.id, name: tablet.name }, workshop: workshop.name, people }
}

export const revokedDto = (row: { id: number; name: string; revoked_at: Date | null }): TabletRevokedDto =>
  ({ id: row.id, name: row.name, revokedAt: row.revoked_at?.toISOString() ?? null })

export async function revokeTablet(actor: Actor, id: number) {
  const db = useDb()
  const existing = await tabletsRepo.byId(db, actor.workshopId, id)
  if (!existing) notFound('Tablet')
  const row = (await tabletsRepo.revoke(db, actor.workshopId, id)) ?? existing
  await userSessionsRepo.endForTablet(db, actor.workshopId, id)
  // requireRole refuses the tablet's session on its next request; its live socket goes now
  realtimeServer()?.in(liveRooms.tablet(id)).disconnectSockets(true)
  return row
}

/** Sets or changes the actor's PIN after checking their password (failures count as failed sign-ins). */
export async function setOwnPin(event: H3Event, actor: Actor, pin: string, password: string) {
  const db = useDb()
  const key = actor.email.toLowerCase()
  await assertNotLimited('loginAccount', key, event)
  const user = await usersRepo.byId(db, actor.workshopId, actor.id)
  if (!(await verifyOrBurn(user?.password_hash, password))) {
    await spendAttempt('loginAccount', key, event)
    throw createError({
      statusCode: 403, message: 'That is not your password',
      data: { problems: [{ field: 'password', message: 'That is not your password' }] },
    })
  }
  // the same scrypt as passwords, through the same bound; with so few possible PINs the hash
  // only keeps them out of plain sight in a dump: the guard is the device and the rate limits
  const pinHash = await hashNewPassword(pin)
  await usersRepo.setPin(db, actor.workshopId, actor.id, pinHash)
}

/**
 * Checks a PIN typed on a tablet. An unknown person, one of another workshop, a disabled one,
 * one without a PIN and one whose role may not use tablets are all refused exactly like a
 * wrong PIN (same status, same words, a hash compared all the same): the answer never tells
 * whose PIN exists. Every refusal counts against the device; it counts against the person only
 * when they are of the tablet's workshop, under `workshop:person`, so no other workshop's
 * tablet (nor a made-up id) can spend a person's allowance and lock them out.
 */
export async function checkTabletPin(event: H3Event, tablet: { id: number; workshop_id: number }, userId: number, pin: string) {
  const deviceKey = String(tablet.id)
  const personKey = `${tablet.workshop_id}:${userId}`
  await assertNotLimited('pinDevice', deviceKey, event)
  await assertNotLimited('pinPerson', personKey, event)
  const db = useDb()
  const user = await usersRepo.byId(db, tablet.workshop_id, userId)
  const eligible = user && !user.disabled_at && isTabletRole(user.role)
  const ok = await verifyOrBurn(eligible ? await usersRepo.pinHash(db, tablet.workshop_id, userId) : null, pin)
  if (!eligible || !ok) {
    await spendAttempt('pinDevice', deviceKey, event)
    if (user) await spendAttempt('pinPerson', personKey, event)
    throw createError({ statusCode: 401, message: 'That PIN is not right for this person' })
  }
  // the person's own count starts again; the device's does not, or knowing one's own PIN
  // would let anyone wipe the tablet's count between guesses at someone else's
  await clearAttempts('pinPerson', personKey)
  await tabletsRepo.touch(db, tablet.id)
  return user
}
