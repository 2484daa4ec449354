// The shared tablet's device cookie: a random token a lead's "use this device as a shared
// tablet" sets (only its SHA-256 is kept, in tablet_devices.token_hash). Casters and
// finishers switch in on such a device with their PIN; their session then names the tablet
// and ends when the cookie goes or a lead revokes the device.
import type { H3Event } from 'h3'
import type { SessionUserData } from '#shared/types/auth'
import { TABLET_COOKIE } from '#shared/utils/tablet-schemas'
import type { TabletRow } from '../repos/tablets'
import { checkTablet } from './session-checks'

/**
 * A year: a workshop tablet stays a tablet until a lead revokes it. Chromium caps a cookie's
 * lifetime at 400 days (RFC 6265bis, "cookie-age-limit"); every switch sets it again, so a
 * tablet in use never runs out.
 */
const TABLET_COOKIE_MAX_AGE_S = 365 * 86_400

export function setTabletCookie(event: H3Event, token: string) {
  setCookie(event, TABLET_COOKIE, token, {
    httpOnly: true, sameSite: 'lax', secure: secureCookies(), path: '/', maxAge: TABLET_COOKIE_MAX_AGE_S,
  })
}

export function clearTabletCookie(event: H3Event) {
  deleteCookie(event, TABLET_COOKIE, { httpOnly: true, sameSite: 'lax', secure: secureCookies(), path: '/' })
}

/** The live (not revoked) tablet a device token belongs to. */
export async function liveTablet(token: string | undefined): Promise<TabletRow | undefined> {
  if (!token || token.length > 128) return undefined
  const row = await checkTablet(hashLinkToken(token))
  return row && !row.revoked_at ? row : undefined
}

/** For a PIN session: is this request still on its tablet, and is that tablet still signed in? */
export async function tabletOfSession(user: SessionUserData, token: string | undefined) {
  if (!user.tablet) return undefined
  const row = await liveTablet(token)
  return row && row.id === user.tablet.id && row.workshop_id === user.workshopId ? row : undefined
}

/**
 * The tablet this request comes from, for the picker and the switch: 401 without a device
 * cookie, and 401 (clearing the cookie) when a lead revoked the device.
 */
export async function requireTablet(event: H3Event): Promise<TabletRow> {
  const token = getCookie(event, TABLET_COOKIE)
  if (!token) throw createError({ statusCode: 401, message: 'This device is not a shared tablet; a lead can sign it in as one' })
  const row = await liveTablet(token)
  if (!row) {
    clearTabletCookie(event)
    throw createError({ statusCode: 401, message: 'This tablet was signed out by a lead; a lead can sign it in again' })
  }
  return row
}
