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

const handler: NitroErrorHandler = (error, event) => {
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
  console.warn(`[database] ${event.method} ${event.path}: ${error.cause instanceof Error ? error.cause.message : error.message}`)
  error.statusCode = 503
  error.statusMessage = 'Service Unavailable'
  error.message = DATABASE_DOWN_MESSAGE
  error.data = { retryAfter: DATABASE_RETRY_AFTER_SECONDS }
  // shown to the person, not hidden as an unexpected fault (Nitro hides an unhandled error's message)
  error.unhandled = false
  setResponseHeader(event, 'retry-after', DATABASE_RETRY_AFTER_SECONDS)
}

export default handler
