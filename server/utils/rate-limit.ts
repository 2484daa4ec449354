// Sign-in, reset and PIN limits in PostgreSQL (rate-limiter-flexible's Postgres store), so
// they hold across app instances and restarts.
import { RateLimiterPostgres, RateLimiterRes } from 'rate-limiter-flexible'
import type { H3Event } from 'h3'

interface LimitSpec { points: number; durationS: number; what: string }

export const LIMITS = {
  // A handful of wrong passwords per account, a few more per address (OWASP Authentication
  // Cheat Sheet: throttle per account and per source); counted on failures only.
  loginAccount: { points: 5, durationS: 15 * 60, what: 'failed sign-ins for this account' },
  loginAddress: { points: 20, durationS: 15 * 60, what: 'failed sign-ins from this address' },
  resetAddress: { points: 5, durationS: 60 * 60, what: 'password reset requests from this address' },
  // Reset and invitation links carry 256 random bits and work once, so guessing one is hopeless;
  // what an address can still do is ask again and again. A password is hashed only for a live
  // link (each one once), so the failures (an unknown, used or expired link) are what is
  // counted, per address (OWASP Authentication Cheat Sheet, "Login Throttling"; Forgot Password
  // Cheat Sheet: protect the reset endpoint from abuse). A person with a good link is never held
  // back by someone else's failures on the shop's shared address.
  resetConfirmAddress: { points: 10, durationS: 15 * 60, what: 'unusable reset links from this address' },
  inviteAcceptAddress: { points: 10, durationS: 15 * 60, what: 'unusable invitation links from this address' },
  // The first-run set-up code has 60 random bits (12 of 31 symbols) and expires within the hour:
  // wrong codes are counted per address like unusable links (same sources as above).
  setupAddress: { points: 10, durationS: 15 * 60, what: 'wrong set-up codes from this address' },
  // A shared tablet's PIN is a few digits, so wrong guesses are counted per device (one
  // tablet cannot try many) and per person across the workshop's devices (several tablets
  // cannot share out the guessing at one person's PIN; the key is `workshop:person`, and only
  // a person of the tablet's own workshop is counted, so no one else can lock them out). 10 a half-hour lets a person mistype, and keeps a
  // determined guesser to a few hundred tries a day against 10,000+ four-digit PINs (common practice).
  pinDevice: { points: 5, durationS: 10 * 60, what: 'wrong PINs on this tablet' },
  pinPerson: { points: 10, durationS: 30 * 60, what: 'wrong PINs for this person' },
} satisfies Record<string, LimitSpec>

type LimitName = keyof typeof LIMITS
const limiters = new Map<LimitName, RateLimiterPostgres>()

function limiter(name: LimitName) {
  let l = limiters.get(name)
  if (!l) {
    const spec = LIMITS[name]
    l = new RateLimiterPostgres({
      storeClient: useDb(), storeType: 'knex', tableName: 'rate_limits', tableCreated: true,
      keyPrefix: name, points: spec.points, duration: spec.durationS,
    })
    limiters.set(name, l)
  }
  return l
}

/** 429 with the wait in words and, given the event, in a Retry-After header (RFC 9110 §10.2.3). */
function tooMany(name: LimitName, msBeforeNext: number, event?: H3Event): never {
  const minutes = Math.max(1, Math.ceil(msBeforeNext / 60_000))
  if (event) setResponseHeader(event, 'Retry-After', Math.max(1, Math.ceil(msBeforeNext / 1000)))
  throw createError({
    statusCode: 429,
    message: `Too many ${LIMITS[name].what}. Try again in ${minutes} minute${minutes === 1 ? '' : 's'}.`,
    data: { retryAfterSeconds: Math.ceil(msBeforeNext / 1000) },
  })
}

/** Refuses with 429 when the key has no points left. */
export async function assertNotLimited(name: LimitName, key: string, event?: H3Event) {
  const res = await limiter(name).get(key)
  if (res && res.remainingPoints <= 0) tooMany(name, res.msBeforeNext, event)
}

/** Counts one attempt; refuses with 429 when that was one too many. */
export async function spendAttempt(name: LimitName, key: string, event?: H3Event) {
  try {
    await limiter(name).consume(key)
  }
  catch (e) {
    if (e instanceof RateLimiterRes) tooMany(name, e.msBeforeNext, event)
    throw e
  }
}

export async function clearAttempts(name: LimitName, key: string) {
  await limiter(name).delete(key)
}

/**
 * The client's address for the per-address limits: the socket's peer, or behind our reverse
 * proxy (TRUST_PROXY=1) the right-most X-Forwarded-For entry (see rightmostForwardedFor).
 * Without TRUST_PROXY the header is ignored: any client can send it.
 */
export function clientAddress(event: H3Event) {
  if (appEnv().TRUST_PROXY) {
    const forwarded = rightmostForwardedFor(event.node.req.headers['x-forwarded-for'])
    if (forwarded) return forwarded
  }
  return getRequestIP(event) ?? 'unknown'
}
