// Reading X-Forwarded-For behind a reverse proxy. Each proxy appends the address it received
// the request from, so only the right-most entry was written by our own proxy; everything to
// its left came with the request and can say anything (MDN, X-Forwarded-For: "Security and
// privacy concerns" / "Selecting an IP address"; RFC 7239 §5.2 and §8 on the same list in
// `Forwarded`). Taking the left-most entry would let a client pick the address it is
// rate-limited under.
import { isIP } from 'node:net'

/** The right-most address of X-Forwarded-For (port and IPv6 brackets dropped), or undefined when it is not an IP address. */
export function rightmostForwardedFor(header: string | string[] | undefined): string | undefined {
  if (header === undefined) return undefined
  // Node joins repeated headers with ', ', in the order they arrived (the last one is the proxy's)
  const list = Array.isArray(header) ? header.join(',') : header
  const last = list.split(',').map(s => s.trim()).filter(Boolean).at(-1)
  if (!last) return undefined
  const bracketed = /^\[([^\]]+)\](?::\d+)?$/.exec(last)
  if (bracketed) return isIP(bracketed[1]!) === 6 ? bracketed[1] : undefined
  if (isIP(last)) return last
  const withPort = /^(\d{1,3}(?:\.\d{1,3}){3}):\d+$/.exec(last)
  if (withPort && isIP(withPort[1]!) === 4) return withPort[1]
  return undefined
}
