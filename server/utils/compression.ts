// On-the-fly compression of the answers the app renders (pages and JSON); the static assets go
// out precompressed by Nitro's compressPublicAssets (nuxt.config.ts) and never pass through here.
// Choosing the coding follows RFC 9110 §12.5.3 (Accept-Encoding): a coding with q=0 is refused,
// `*` stands for any coding not named, and among those allowed the highest q wins; on a tie
// brotli (RFC 7932) goes before gzip (RFC 1952) because it packs text tighter.
// Brotli quality 4 and gzip level 6 for answers built per request: common practice for dynamic
// text, where the top qualities cost tens of milliseconds for a few per cent; the static
// assets, compressed once at build time, get the top levels.
// Bodies under 1 KB go out as they are: the codings' headers and the CPU outweigh the saving
// there (common practice; servers set their minimum length between a few hundred bytes and 1 KB).
import { brotliCompress, constants, gzip } from 'node:zlib'
import { promisify } from 'node:util'

export type Coding = 'br' | 'gzip'

export const MIN_COMPRESS_BYTES = 1024

const brotli = promisify(brotliCompress)
const gz = promisify(gzip)

/** The coding to answer with for this Accept-Encoding header, or undefined for identity. */
export function pickCoding(acceptEncoding: string | undefined): Coding | undefined {
  if (!acceptEncoding) return undefined
  const q = new Map<string, number>()
  for (const part of acceptEncoding.split(',')) {
    const [name, ...params] = part.trim().toLowerCase().split(';')
    if (!name) continue
    const qParam = params.map(p => p.trim()).find(p => p.startsWith('q='))
    const value = qParam ? Number(qParam.slice(2)) : 1
    q.set(name, Number.isFinite(value) ? value : 0)
  }
  const weight = (c: Coding) => q.get(c) ?? q.get('*') ?? 0
  const best = (['br', 'gzip'] as const).filter(c => weight(c) > 0).sort((a, b) => weight(b) - weight(a))[0]
  return best
}

/** Text worth compressing: pages, JSON, scripts, styles, SVG, CSV; not images, fonts, archives or event streams. */
export function isCompressibleType(contentType: string | undefined): boolean {
  const type = (contentType ?? '').split(';')[0]!.trim().toLowerCase()
  if (!type || type === 'text/event-stream') return false
  return type.startsWith('text/') || type === 'application/json' || type.endsWith('+json')
    || type === 'application/javascript' || type === 'image/svg+xml' || type === 'application/xml'
}

export function compress(body: Buffer, coding: Coding): Promise<Buffer> {
  return coding === 'br'
    ? brotli(body, { params: { [constants.BROTLI_PARAM_QUALITY]: 4, [constants.BROTLI_PARAM_SIZE_HINT]: body.length } })
    : gz(body, { level: 6 })
}
