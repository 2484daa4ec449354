// Where a request comes from: the one rule shared by state-changing API routes and the live
// socket's handshake. A browser names the page that made a cross-site request in `Origin`
// (always on websocket handshakes and on POST/PUT/PATCH/DELETE; RFC 6454 §7, Fetch standard)
// and marks it `Sec-Fetch-Site: cross-site` (W3C Fetch Metadata). A request is our own when
// its Origin is absent (a non-browser client, which carries no ambient cookie of a victim),
// equals APP_URL's origin, or names the very host the request was sent to (the server
// reached by its LAN address or behind a TLS proxy that keeps the Host header): the OWASP
// CSRF Prevention Cheat Sheet's "verify origin with standard headers".
import type { IncomingHttpHeaders } from 'node:http'

function originOf(url: string) {
  try {
    return new URL(url).origin
  }
  catch {
    return undefined
  }
}

/** True when the headers say a browser sent this from a page that is not Setline's. */
export function isForeignRequest(headers: IncomingHttpHeaders, appUrl = appEnv().APP_URL) {
  if (headers['sec-fetch-site'] === 'cross-site') return true
  const origin = headers.origin
  if (!origin) return false
  if (origin === 'null') return true
  const from = originOf(origin)
  if (!from) return true
  if (from === originOf(appUrl)) return false
  const host = headers['x-forwarded-host'] && appEnv().TRUST_PROXY ? String(headers['x-forwarded-host']).split(',')[0]!.trim() : headers.host
  return !host || new URL(from).host !== host
}
