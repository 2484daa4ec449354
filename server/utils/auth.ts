// Sessions, roles and workshop scope. Every route starts with requireRole(event, ...roles).
//
// A session lives on the server: startSession records it in user_sessions (only the SHA-256 of
// its random id, which rides in the sealed cookie's server-only part) and every clear of the
// cookie ends the record (server/plugins/sessions.ts), so a copied cookie dies at sign-out. A
// change that takes rights away acts at once and on every instance: endUserSessions (ends the
// records and disconnects the person's sockets) after a password, role or disabled change,
// disconnectSession on sign-out, leaveJob when a client leaves a job (server/utils/realtime.ts).
import type { H3Event } from 'h3'
import pLimit from 'p-limit'
import type { Role, SessionUserData } from '#shared/types/auth'
import { userSessionsRepo } from '../repos/user-sessions'
import { TABLET_COOKIE } from '#shared/utils/tablet-schemas'
import { tabletOfSession } from './tablet'
import { checkSessionUser } from './session-checks'

export type Actor = SessionUserData

declare module 'h3' {
  interface H3EventContext { workshopId?: number }
}

/** What the sealed cookie holds: the user, and the server-only random id of its session record. */
export interface SealedSession { user?: SessionUserData; secure?: { sid?: string } }

/** Seconds a session lasts: the sealed cookie's max age (nuxt.config.ts runtimeConfig.session). */
export function sessionMaxAge() {
  return (useRuntimeConfig().session as { maxAge?: number }).maxAge ?? 60 * 60 * 12
}

/**
 * The user row of a sealed session when everything still lets it in: its server-side record
 * is live (not signed out, not expired), the user is enabled and their session version has
 * not moved on. One query (the user joined with the record), shared with the checks of the
 * same turn (server/utils/session-checks.ts). Undefined otherwise.
 */
export async function liveSessionUser(session: SealedSession) {
  const user = session.user
  const sid = session.secure?.sid
  if (!user?.id || !sid || sid.length > 128) return undefined
  const row = await checkSessionUser({ workshopId: user.workshopId, userId: user.id, tokenHash: hashLinkToken(sid) })
  if (!row?.session_id || !row.session_expires_at || row.disabled_at || row.session_version !== user.sv) return undefined
  return { ...row, session_id: row.session_id, session_expires_at: row.session_expires_at }
}

/** The session cookie's name (nuxt.config.ts runtimeConfig.session). */
export function sessionCookieName() {
  return (useRuntimeConfig().session as { name?: string }).name ?? 'nuxt-session'
}

/**
 * Unsealed cookies by their sealed text, each until its session's age limit. Unsealing is a
 * pure function of the cookie and the server's secret, and it costs a few WebCrypto calls per
 * request (a quarter of the floor read's time under load, measured by tests/bench/readers.ts);
 * what a session may do is still checked in the database on every request (liveSessionUser).
 * At most UNSEALED_KEPT cookies, the oldest dropped first.
 */
const unsealedCookies = new Map<string, { session: SealedSession; until: number }>()
const UNSEALED_KEPT = 5000

/** A sealed session cookie's contents; empty when it is missing, forged, or past its age. */
export async function unsealedCookie(sealed: string | undefined): Promise<SealedSession> {
  if (!sealed || sealed.length > 8192) return {}
  const kept = unsealedCookies.get(sealed)
  if (kept && Date.now() < kept.until) return kept.session
  try {
    const maxAgeS = sessionMaxAge()
    const unsealed = await unsealSession(undefined as never, { password: process.env.NUXT_SESSION_PASSWORD ?? '', maxAge: maxAgeS }, sealed)
    const session = unsealed.data as SealedSession
    if (unsealedCookies.size >= UNSEALED_KEPT) unsealedCookies.delete(unsealedCookies.keys().next().value!)
    unsealedCookies.set(sealed, { session, until: (unsealed.createdAt ?? 0) + maxAgeS * 1000 })
    return session
  }
  catch {
    return {}
  }
}

/**
 * Checks the sealed session, then its server-side record and the user row: a session that
 * was signed out or expired, a disabled user, or one whose session version moved on
 * (password reset, disable, role change), is signed out with 401.
 * A role outside `roles` gets 403. Returns the actor whose workshopId scopes every query.
 */
export async function requireRole(event: H3Event, ...roles: Role[]): Promise<Actor> {
  const session = await unsealedCookie(getCookie(event, sessionCookieName()))
  const user = session.user as Actor | undefined
  if (!user?.id) throw createError({ statusCode: 401, message: 'Please sign in' })
  // a PIN session lives only on its tablet, and only while a lead has not revoked it (checked
  // first: revoking also ends the session's record, and this message says why)
  if (user.tablet && !(await tabletOfSession(user, getCookie(event, TABLET_COOKIE)))) {
    await endSession(event)
    throw createError({ statusCode: 401, message: 'This tablet is no longer signed in; a lead can sign it in again' })
  }
  const row = await liveSessionUser(session)
  if (!row) {
    await endSession(event)
    throw createError({ statusCode: 401, message: 'Your session has ended; please sign in again' })
  }
  // the workshop a write changes: its kept answers are dropped as it answers (server/plugins/read-cache.ts)
  event.context.workshopId = user.workshopId
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

/**
 * Starts a session for a user; `tablet` marks one begun with a PIN on a shared tablet. A
 * session this browser had before ends first, and the new one gets a fresh random id
 * (OWASP Session Management Cheat Sheet: renew the session id on sign-in). The id stays in
 * the cookie's `secure` part, which nuxt-auth-utils never sends to the page.
 */
export async function startSession(event: H3Event, row: { id: number; workshop_id: number; role: Role; name: string; email: string; session_version: number }, tablet?: { id: number; name: string }) {
  await endSessionRecord(await getUserSession(event) as SealedSession)
  const { token, hash } = newLinkToken()
  const db = useDb()
  await userSessionsRepo.pruneForUser(db, row.workshop_id, row.id)
  await userSessionsRepo.start(db, { workshop_id: row.workshop_id, user_id: row.id, token_hash: hash, tablet_id: tablet?.id ?? null }, sessionMaxAge())
  await replaceUserSession(event, {
    user: { id: row.id, workshopId: row.workshop_id, role: row.role, name: row.name, email: row.email, sv: row.session_version, ...(tablet ? { tablet } : {}) },
    secure: { sid: token },
    loggedInAt: Date.now(),
  }, cookieConfig())
}

/** Ends a session's server-side record and drops the live sockets opened with it. */
export async function endSessionRecord(session: SealedSession) {
  const sid = session.secure?.sid
  if (!sid || sid.length > 128) return
  const ended = await userSessionsRepo.end(useDb(), hashLinkToken(sid))
  if (ended) disconnectSession(Number(ended.id))
}

/**
 * Signs this browser out: the record ends (server/plugins/sessions.ts hooks every clear of
 * the cookie, nuxt-auth-utils' own DELETE /api/_auth/session included), so a copy of the
 * cookie made before is refused too, and the cookie is cleared.
 */
export async function endSession(event: H3Event) {
  await clearUserSession(event, cookieConfig())
}

/**
 * Ends every session of a person and drops their live sockets, after their password, role or
 * enabled state changed. Their session version moved on too, which already refuses the old
 * cookies; the records say so as well.
 */
export async function endUserSessions(workshopId: number, userId: number) {
  await userSessionsRepo.endForUser(useDb(), workshopId, userId)
  disconnectUser(userId)
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
