// Compresses the pages and JSON answers the app builds per request (the board, the register, the
// floor and finishing screens answer tens to hundreds of KB of JSON), just before h3 writes them
// (server/utils/compression.ts says which coding and why). Left alone: answers a handler already
// wrote itself (streams, CSV, photos), event streams, socket.io's transport, bodies under 1 KB,
// types that are compressed already (images, fonts) and anything already carrying a
// Content-Encoding (the precompressed static assets). Vary: Accept-Encoding goes on every answer
// that could have been compressed, so a cache in between keeps the codings apart (RFC 9110 §12.5.5).
import type { H3Event } from 'h3'
import { compress, isCompressibleType, MIN_COMPRESS_BYTES, pickCoding } from '../utils/compression'

/** The body as bytes with its content type, when it is text h3 would send in one piece. */
function asBytes(body: unknown, contentType: string | undefined): { bytes: Buffer; type: string } | undefined {
  if (typeof body === 'string') return { bytes: Buffer.from(body), type: contentType ?? 'text/html' }
  if (body instanceof Uint8Array) return contentType ? { bytes: Buffer.from(body.buffer, body.byteOffset, body.byteLength), type: contentType } : undefined
  if (body === null || typeof body !== 'object') return undefined
  const o = body as { pipe?: unknown; getReader?: unknown; arrayBuffer?: unknown }
  if (typeof o.pipe === 'function' || typeof o.getReader === 'function' || typeof o.arrayBuffer === 'function' || body instanceof Response || body instanceof Error) return undefined
  return { bytes: Buffer.from(JSON.stringify(body)), type: contentType ?? 'application/json' }
}

function skip(event: H3Event) {
  const status = event.node.res.statusCode
  return event.handled || event.method === 'HEAD' || status === 204 || status === 304 || status < 200
    || event.path.startsWith('/socket.io/')
    // the error page is rendered by an internal request whose headers the error handler copies
    // onto the real answer while reading the body decoded: compressing it would send a gzip
    // header over plain bytes. The outer answer is small HTML; it goes uncompressed.
    || event.path.startsWith('/__nuxt_error')
    || !!getResponseHeader(event, 'content-encoding')
    || /no-transform/i.test(String(getResponseHeader(event, 'cache-control') ?? ''))
}

export default defineNitroPlugin((nitroApp) => {
  nitroApp.hooks.hook('beforeResponse', async (event, response) => {
    if (skip(event)) return
    const contentType = getResponseHeader(event, 'content-type')
    const found = asBytes(response.body, contentType === undefined ? undefined : String(contentType))
    if (!found || !isCompressibleType(found.type) || found.bytes.length < MIN_COMPRESS_BYTES) return
    appendResponseHeader(event, 'vary', 'Accept-Encoding')
    const coding = pickCoding(getRequestHeader(event, 'accept-encoding'))
    if (!coding) return
    response.body = await compress(found.bytes, coding)
    setResponseHeader(event, 'content-type', found.type)
    setResponseHeader(event, 'content-encoding', coding)
    removeResponseHeader(event, 'content-length')
  })
})
