// The first of Nitro's error handlers (nuxt.config.ts puts it before Nuxt's own): a model
// input error becomes its 422 (asHttpError, server/utils/errors.ts); when the database is not
// answering, the error becomes a 503 with Retry-After and a plain message
// (server/utils/database-down.ts). It sends nothing itself: the next handlers answer, Nuxt's
// with its error page for a page request and Nitro's with JSON for the API, both with this
// status and message.
import type { NitroErrorHandler } from 'nitropack'
import { H3Error, setResponseHeader } from 'h3'
import { DATABASE_DOWN_MESSAGE, DATABASE_RETRY_AFTER_SECONDS, isDatabaseUnavailable } from './utils/database-down'
import { asHttpError } from './utils/errors'
import { loggablePath, useLogger } from './utils/logger'

/** The reason phrases of RFC 9110 §15 for the refusals Setline answers with. */
const REASON_PHRASES: Record<number, string> = {
  400: 'Bad Request', 401: 'Unauthorized', 403: 'Forbidden', 404: 'Not Found', 405: 'Method Not Allowed',
  409: 'Conflict', 413: 'Content Too Large', 415: 'Unsupported Media Type', 422: 'Unprocessable Content', 429: 'Too Many Requests',
}

const handler: NitroErrorHandler = (error, event) => {
  // a refusal made with createError({ statusCode, message }) has no status message of its own:
  // without this, a 401, 404 or 409 goes out as "Server Error"
  const phrase = REASON_PHRASES[error.statusCode]
  if (phrase && (!error.statusMessage || error.statusMessage === 'Server Error')) error.statusMessage = phrase
  const refusal = asHttpError(error.cause)
  if (refusal !== error.cause && refusal instanceof H3Error) {
    error.statusCode = refusal.statusCode
    error.statusMessage = refusal.statusMessage
    error.message = refusal.message
    error.data = refusal.data
    // the person's own input, not an unexpected fault: the message is shown (Nitro hides an unhandled error's)
    error.unhandled = false
    return
  }
  if (!isDatabaseUnavailable(error)) return
  useLogger().warn({ reqId: event.context.requestId, method: event.method, path: loggablePath(event.path), err: { message: error.cause instanceof Error ? error.cause.message : error.message } }, 'database not answering')
  error.statusCode = 503
  error.statusMessage = 'Service Unavailable'
  error.message = DATABASE_DOWN_MESSAGE
  error.data = { retryAfter: DATABASE_RETRY_AFTER_SECONDS }
  // shown to the person, not hidden as an unexpected fault (Nitro hides an unhandled error's message)
  error.unhandled = false
  setResponseHeader(event, 'retry-after', DATABASE_RETRY_AFTER_SECONDS)
}

export default handler
