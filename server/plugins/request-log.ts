// Structured request logs (server/utils/logger.ts): one line per answered request with a
// request id, which the answer carries as X-Request-Id so a person's report can be matched to
// its line. Behind the proxy (TRUST_PROXY=1) the proxy's own id is kept when it sends a sane
// one, so its access log and ours share it. Static files and the health probes log at debug.
import { randomUUID } from 'node:crypto'
import type { H3Event } from 'h3'

declare module 'h3' {
  interface H3EventContext { requestId?: string; requestStart?: number }
}

const SANE_ID = /^[\w-]{8,64}$/
const QUIET = /^\/(_nuxt\/|__nuxt|favicon|icons\/|manifest|sw\.js|workbox-|api\/health$|api\/ready$)/

function requestId(event: H3Event): string {
  const fromProxy = appEnv().TRUST_PROXY ? getRequestHeader(event, 'x-request-id') : undefined
  return fromProxy && SANE_ID.test(fromProxy) ? fromProxy : randomUUID()
}

export default defineNitroPlugin((nitro) => {
  const log = useLogger()
  nitro.hooks.hook('request', (event) => {
    event.context.requestId = requestId(event)
    event.context.requestStart = performance.now()
    setResponseHeader(event, 'x-request-id', event.context.requestId)
  })
  nitro.hooks.hook('afterResponse', (event) => {
    const path = loggablePath(event.path)
    const line = {
      reqId: event.context.requestId,
      method: event.method,
      path,
      status: event.node.res.statusCode,
      ms: Math.round((performance.now() - (event.context.requestStart ?? performance.now())) * 10) / 10,
    }
    if (QUIET.test(path)) log.debug(line, 'request')
    else log.info(line, 'request')
  })
  nitro.hooks.hook('error', (error, { event }) => {
    // h3 refusals (4xx) are answers, not faults: only what became a 5xx is logged as an error
    const status = (error as { statusCode?: number }).statusCode ?? 500
    if (status < 500) return
    log.error({ reqId: event?.context.requestId, path: event ? loggablePath(event.path) : undefined, err: { message: error.message, stack: error.stack } }, 'request failed')
  })
})
