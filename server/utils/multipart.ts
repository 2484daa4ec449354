// A multipart/form-data body (RFC 7578) split into its parts with Buffer.indexOf, the parts'
// bytes left as views into the body. h3's readMultipartFormData walks the body byte by byte into a
// JavaScript array: a 13 MB, 50-megapixel photo took about 10 s and 400 to 700 MB of server
// memory that way (tests/bench/upload.ts); here it is one pass in native code and no copy.
// Nothing in the server calls it now: uploads are streamed with @fastify/busboy instead of held
// in memory (server/utils/photo-upload.ts). It is kept, with its unit test, until that is settled.

export interface MultipartPart {
  /** the form field's name */
  name: string
  /** the file name when the part is a file (possibly empty); undefined for a plain field */
  filename?: string
  type?: string
  data: Buffer
}

/** The boundary parameter of a multipart/form-data content type, quoted or not (RFC 2046 §5.1.1). */
export function multipartBoundary(contentType: string): string | undefined {
  if (!/^multipart\/form-data\b/i.test(contentType)) return undefined
  const m = contentType.match(/;\s*boundary=(?:"([^"]{1,70})"|([^\s;"]{1,70}))\s*(?:;|$)/i)
  return m?.[1] ?? m?.[2]
}

/** A quoted or bare parameter of a Content-Disposition header value. */
function param(header: string, key: string): string | undefined {
  const m = header.match(new RegExp(`;\\s*${key}=(?:"((?:[^"\\\\]|\\\\.)*)"|([^;\\s]*))`, 'i'))
  if (!m) return undefined
  return m[1] !== undefined ? m[1].replace(/\\(.)/g, '$1') : m[2]
}

/**
 * The parts of a multipart body, in order. A part with no name, or a body that breaks off, ends
 * the reading: what was complete before it is returned, and a caller that finds nothing it
 * needs answers 4xx (a malformed upload is the sender's fault, never a 500).
 */
export function parseMultipart(body: Buffer, boundary: string): MultipartPart[] {
  const first = Buffer.from(`--${boundary}`)
  const delimiter = Buffer.from(`\r\n--${boundary}`)
  const parts: MultipartPart[] = []
  let at = body.indexOf(first)
  if (at < 0) return parts
  at += first.length
  for (;;) {
    // after a delimiter: "--" closes the body, CRLF starts a part (RFC 2046 §5.1.1)
    if (body[at] === 0x2D && body[at + 1] === 0x2D) return parts
    const lineEnd = body.indexOf('\r\n', at)
    if (lineEnd < 0) return parts
    const headersEnd = body.indexOf('\r\n\r\n', lineEnd)
    if (headersEnd < 0) return parts
    const headers = lineEnd === headersEnd ? [] : body.toString('utf8', lineEnd + 2, headersEnd).split('\r\n')
    const dataStart = headersEnd + 4
    const dataEnd = body.indexOf(delimiter, dataStart)
    if (dataEnd < 0) return parts
    const header = (key: string) => headers.find(h => h.toLowerCase().startsWith(`${key}:`))?.slice(key.length + 1).trim()
    const disposition = header('content-disposition') ?? ''
    const name = param(disposition, 'name')
    if (!name) return parts
    parts.push({ name, filename: param(disposition, 'filename'), type: header('content-type'), data: body.subarray(dataStart, dataEnd) })
    at = dataEnd + delimiter.length
  }
}
