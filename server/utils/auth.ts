// Sessions, roles and workshop scope. Every route starts with requireRole(event, ...roles).
import type { H3Event } from 'h3'
import pLimit from 'p-limit'
import type { Role, SessionUserData } from '#shared/types/auth'
import { usersRepo } from '../repos/users'
import { TABLET_COOKIE } from '#shared/utils/tablet-schemas'
import { tabletOfSession } from './tablet'

export type Actor = SessionUserData

/**
 * Checks the sealed session, then the user row: a disabled user, or one whose session
 * version moved on (password reset, disable, role change), is signed out with 401.
 * A role outside `roles` gets 403. Returns the actor whose workshopId scopes every query.
 */
export async function requireRole(event: H3Event, ...roles: Role[]): Promise<Actor> {
  const session = await getUserSession(event)
  const user = session.user as Actor | undefined
  if (!user?.id) throw createError({ statusCode: 401, message: 'Please sign in' })
  const row = await usersRepo.byId(useDb(), user.workshopId, user.id)
  if (!row || row.disabled_at || row.session_version !== user.sv) {
    await endSession(event)
    throw createError({ statusCode: 401, message: 'Your session has ended; please sign in again' })
  }
  // a PIN session lives only on its tablet, and only while a lead has not revoked it
  if (user.tablet && !(await tabletOfSession(user, getCookie(event, TABLET_COOKIE)))) {
    await endSession(event)
    throw createError({ statusCode: 401, message: 'This tablet is no longer signed in; a lead can sign it in again' })
  }
  if (roles.length && !roles.includes(row.role)) {
    throw createError({ statusCode: 403, message: `This needs the ${roles.join(' or ')} role` })
  }
  return { ...user, role: row.role, name: row.name }
}

export const STAFF: Role[] = ['lead', 'caster', 'finisher']
export const EVERYONE: Role[] = ['lead', 'caster', 'finisher', 'client']

/** Cookies are Secure when people reach Setline over https (APP_URL). */
export function secureCookies() {
  return appEnv().APP_URL.startsWith('https:')
}

function cookieConfig() {
  return { cookie: { sameSite: 'lax' as const, httpOnly: true, secure: secureCookies() } }
}

/** Starts a session for a user; `tablet` marks one begun with a PIN on a shared tablet. */
export async function startSession(event: H3Event, row: { id: number; workshop_id: number; role: Role; name: string; email: string; session_version: number }, tablet?: { id: number; name: string }) {
  await replaceUserSession(event, {
    user: { id: row.id, workshopId: row.workshop_id, role: row.role, name: row.name, email: row.email, sv: row.session_version, ...(tablet ? { tablet } : {}) },
    loggedInAt: Date.now(),
  }, cookieConfig())
}

export async function endSession(event: H3Event) {
  await clearUserSession(event, cookieConfig())
}

// scrypt at N = 2^17 takes 128 MiB and a few hundred ms per hash: bound how many run at once
// so a burst of sign-ins queues instead of exhausting memory.
let limiter: ReturnType<typeof pLimit> | undefined
export function hashSlot<T>(fn: () => Promise<T>): Promise<T> {
  limiter ??= pLimit(appEnv().LOGIN_MAX_CONCURRENCY)
  return limiter(fn)
}

let dummyHash: Promise<string> | undefined
/** Verifies against a throwaway hash when the account does not exist, so timing does not tell. */
export async function verifyOrBurn(hash: string | null | undefined, password: string) {
  if (!hash) {
    dummyHash ??= hashPassword('not-a-real-password-' + Math.random())
    await hashSlot(async () => verifyPassword(await dummyHash!, password))
    return false
  }
  return hashSlot(() => verifyPassword(hash, password))
}

export function hashNewPassword(password: string) {
  return hashSlot(() => hashPassword(password))
}
