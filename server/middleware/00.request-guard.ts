// The rules every state-changing API request passes before a route sees it, in one place:
// 1. Not from another site: a foreign Origin or `Sec-Fetch-Site: cross-site` is a 403
//    (server/utils/origin.ts; OWASP CSRF Prevention Cheat Sheet, "verify origin with standard
//    headers" and "Fetch Metadata headers").
// 2. Only JSON, or multipart/form-data on the routes that take a file: anything else is a 415
//    (RFC 9110 §15.5.16). A plain HTML form on another site can only send urlencoded,
//    multipart or text/plain bodies without a CORS preflight (Fetch standard, "CORS-safelisted
//    request-header"), so demanding JSON is a second wall against cross-site posts (OWASP CSRF
//    Prevention Cheat Sheet, "custom request headers"/content type). A request without a body
//    (logout, revoke, void) needs no content type.
// 3. Not too large: a declared Content-Length over the route's limit is a 413 before a byte is
//    read (RFC 9110 §15.5.14); a chunked JSON body is counted as it arrives and refused as soon
//    as it passes the limit, and what was read is handed to the route (h3's readBody), so no
//    route reads an unbounded body. Uploads are streamed and bounded by server/utils/photo-upload.ts.
import type { IncomingMessage } from 'node:http'
import { jsonBodyLimit, takesMultipart, uploadBodyLimit } from '../utils/body-limits'
import { isForeignRequest } from '../utils/origin'

const WRITES = new Set(['POST', 'PUT', 'PATCH', 'DELETE'])
/** Where h3's readRawBody looks first for a body already read (h3 1.x, readRawBody). */
const H3_RAW_BODY = Symbol.for('h3RawBody')

function tooLarge(limit: number): never {
  const size = limit >= 1048576 ? `${Math.round(limit / 1048576)} MB` : `${Math.round(limit / 1024)} KB`
  throw createError({ statusCode: 413, message: `The request is too large: at most ${size}` })
}

/** The body, refused with 413 as soon as it passes `limit` bytes (nothing past that is kept). */
function readUpTo(req: IncomingMessage, limit: number): Promise<Buffer> {
  return new Promise((resolve, reject) => {
    const chunks: Buffer[] = []
    let size = 0
    const onData = (chunk: Buffer) => {
      size += chunk.length
      if (size <= limit) {
        chunks.push(chunk)
        return
      }
      // the rest of the body is discarded by Node once the 413 is sent
      req.off('data', onData)
      try {
        tooLarge(limit)
      }
      catch (err) {
        reject(err)
      }
    }
    req.on('data', onData)
    req.on('end', () => resolve(Buffer.concat(chunks, size)))
    // the sender went away mid-body: a 4xx nobody reads, not a 500 in the log
    req.on('error', () => reject(createError({ statusCode: 400, message: 'The request body broke off' })))
  })
}

export default defineEventHandler(async (event) => {
  const method = event.method
  const path = event.path.split('?')[0]!
  if (!WRITES.has(method) || !path.startsWith('/api/')) return
  const req = event.node.req
  if (isForeignRequest(req.headers)) {
    throw createError({ statusCode: 403, message: 'This request came from another website and was refused: make the change in Setline itself' })
  }
  const type = (req.headers['content-type'] ?? '').split(';')[0]!.trim().toLowerCase()
  const declared = req.headers['content-length'] === undefined ? undefined : Number(req.headers['content-length'])
  const chunked = /\bchunked\b/i.test(String(req.headers['transfer-encoding'] ?? ''))
  const hasBody = chunked || (declared !== undefined && declared > 0)
  if (!type) {
    if (hasBody) throw createError({ statusCode: 415, message: 'Send the request body as JSON (Content-Type: application/json)' })
    return
  }
  if (type === 'multipart/form-data' && takesMultipart(method, path)) {
    if (declared !== undefined && declared > uploadBodyLimit(appEnv().PHOTO_MAX_BYTES)) tooLarge(uploadBodyLimit(appEnv().PHOTO_MAX_BYTES))
    return
  }
  if (type !== 'application/json') {
    throw createError({ statusCode: 415, message: takesMultipart(method, path) ? 'Send the photos as multipart/form-data, or other data as JSON' : 'Send the request body as JSON (Content-Type: application/json)' })
  }
  const limit = jsonBodyLimit(method, path)
  if (declared !== undefined && declared > limit) tooLarge(limit)
  if (!hasBody) return
  const body = await readUpTo(req, limit)
  Reflect.set(req, H3_RAW_BODY, Promise.resolve(body))
})
