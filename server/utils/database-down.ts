// Telling "the database is not answering" apart from a fault in a request. While PostgreSQL
// restarts, is stopped or refuses connections, every request fails the same way: that is a
// 503 Service Unavailable with Retry-After (RFC 9110 §15.6.4, §10.2.3), not a 500; knex's pool
// reconnects by itself once the database is back, so the next try after the wait succeeds.

/** Seconds a client is asked to wait before trying again. */
export const DATABASE_RETRY_AFTER_SECONDS = 5

export const DATABASE_DOWN_MESSAGE = 'Setline\'s database is not answering; try again in a moment'

/** Socket errors of a connection that could not be made or was cut (Node.js errno codes). */
const SOCKET_CODES = new Set(['ECONNREFUSED', 'ECONNRESET', 'ETIMEDOUT', 'EHOSTUNREACH', 'ENETUNREACH', 'EPIPE', 'EAI_AGAIN'])

/**
 * PostgreSQL SQLSTATEs of a server that is not there for us (PostgreSQL manual, Appendix A):
 * class 08 connection exceptions, 57P01 admin_shutdown, 57P02 crash_shutdown,
 * 57P03 cannot_connect_now (starting up or shutting down), 53300 too_many_connections.
 */
const PG_CODES = new Set(['08000', '08001', '08003', '08004', '08006', '57P01', '57P02', '57P03', '53300'])

/**
 * What node-postgres and knex say when a connection ends or none can be had. knex puts the
 * query before pg's message ('select … - Connection terminated unexpectedly'), so the words
 * may follow its ' - ' (the soak's seed 20261203 met it as a 500 while PostgreSQL stopped).
 */
const MESSAGES = [/(^|\s-\s)Connection terminated/i, /connection error and is not queryable/i, /Timeout acquiring a connection/i]

interface ErrorLike { code?: unknown; name?: unknown; message?: unknown; cause?: unknown; errors?: unknown }

/** True when `err` (or what it wraps: an H3Error's cause, an AggregateError's errors) is the database being away. */
export function isDatabaseUnavailable(err: unknown, depth = 0): boolean {
  if (!err || typeof err !== 'object' || depth > 5) return false
  const e = err as ErrorLike
  if (typeof e.code === 'string' && (SOCKET_CODES.has(e.code) || PG_CODES.has(e.code))) return true
  if (e.name === 'KnexTimeoutError') return true
  if (typeof e.message === 'string' && MESSAGES.some(rx => rx.test(e.message as string))) return true
  if (Array.isArray(e.errors) && e.errors.some(x => isDatabaseUnavailable(x, depth + 1))) return true
  return isDatabaseUnavailable(e.cause, depth + 1)
}
