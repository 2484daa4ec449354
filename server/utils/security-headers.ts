// The security headers of every answer, and the Content Security Policy of the pages.
// Sources: OWASP HTTP Headers Cheat Sheet and OWASP Content Security Policy Cheat Sheet;
// W3C CSP Level 3 (hash sources, frame-ancestors); W3C Referrer Policy.
import { createHash } from 'node:crypto'

/** Headers on every answer, pages and API alike. */
export const BASE_HEADERS: Record<string, string> = {
  // never guess a type from the bytes (a photo or a CSV read as HTML or script)
  'x-content-type-options': 'nosniff',
  // invitation and reset links carry their token in the URL: send no referrer to other sites
  'referrer-policy': 'same-origin',
  // the legacy twin of frame-ancestors 'none' for browsers without CSP Level 2
  'x-frame-options': 'DENY',
  // API answers (JSON, CSV, photos) are never documents that run anything
  'content-security-policy': 'default-src \'none\'; frame-ancestors \'none\'',
}

/** The SHA-256 CSP source of each inline, executable script in a piece of HTML. */
export function inlineScriptHashes(html: string): string[] {
  const hashes: string[] = []
  for (const m of html.matchAll(/<script\b([^>]*)>([\s\S]*?)<\/script>/gi)) {
    const attrs = m[1]!
    if (/\ssrc\s*=/i.test(attrs)) continue
    const type = attrs.match(/\stype\s*=\s*["']?([^"'\s>]+)/i)?.[1]?.toLowerCase()
    // data blocks (Nuxt's JSON payload) are never run, so CSP does not apply to them
    if (type && !['module', 'text/javascript', 'application/javascript', 'importmap'].includes(type)) continue
    hashes.push(`'sha256-${createHash('sha256').update(m[2]!, 'utf8').digest('base64')}'`)
  }
  return hashes
}

/** A Host header fit to be written into a policy (letters, digits, dots, dashes, a port, IPv6 brackets). */
function safeHost(host: string | undefined) {
  return host && /^[a-z0-9.\-[\]:]{1,255}$/i.test(host) ? host : undefined
}

/**
 * The policy of a page: scripts only from Setline itself plus the framework's own inline
 * scripts by hash; styles may be inline (FullCalendar and Vue style bindings set them);
 * pictures from Setline, blob: and data: (the upload previews); the live socket on the same
 * host (ws/wss named too, for browsers that do not count them as 'self'); no plugins, no
 * framing, forms and <base> only to Setline.
 */
export function pagePolicy(scriptHashes: string[], host: string | undefined) {
  const h = safeHost(host)
  const sockets = h ? ` ws://${h} wss://${h}` : ''
  return [
    'default-src \'self\'',
    `script-src 'self'${scriptHashes.length ? ' ' + [...new Set(scriptHashes)].join(' ') : ''}`,
    'style-src \'self\' \'unsafe-inline\'',
    'img-src \'self\' blob: data:',
    'font-src \'self\' data:',
    `connect-src 'self'${sockets}`,
    'object-src \'none\'',
    'base-uri \'self\'',
    'form-action \'self\'',
    'frame-ancestors \'none\'',
  ].join('; ')
}
