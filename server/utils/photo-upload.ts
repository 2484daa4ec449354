// Reads a multipart photo upload. The whole body is held in memory (the photos are processed
// from buffers), so its size is bounded twice: a declared Content-Length larger than the most
// files we accept, each at the size limit, is refused with 413 before anything is read, and a
// body that grows past that bound while it arrives (chunked, or lying about its length) is cut
// off with the same 413. The parts are split by parseMultipart (server/utils/multipart.ts).
import type { H3Event } from 'h3'
import { PHOTO_MAX_FILES } from '#shared/utils/photo-schemas'
import { multipartBoundary, parseMultipart } from './multipart'

export interface UploadedFile { name: string; data: Buffer }
export interface PhotoUpload { fields: Record<string, string>; files: UploadedFile[] }

/** Room for the multipart boundaries and text fields around the files. */
const FORM_OVERHEAD = 256 * 1024

function tooLarge(maxBytes: number): never {
  throw createError({ statusCode: 413, message: `The upload is too large: at most ${PHOTO_MAX_FILES} photos of ${Math.round(maxBytes / 1048576)} MB each` })
}

/** The request body, refused with 413 as soon as it passes `limit` bytes. */
async function readBodyUpTo(event: H3Event, limit: number, maxBytes: number): Promise<Buffer> {
  const chunks: Buffer[] = []
  let size = 0
  for await (const chunk of event.node.req as AsyncIterable<Buffer>) {
    size += chunk.length
    if (size > limit) tooLarge(maxBytes)
    chunks.push(chunk)
  }
  return Buffer.concat(chunks, size)
}

export async function readPhotoUpload(event: H3Event, maxBytes: number): Promise<PhotoUpload> {
  const limit = maxBytes * PHOTO_MAX_FILES + FORM_OVERHEAD
  const declared = Number(getRequestHeader(event, 'content-length') ?? 0)
  if (declared > limit) tooLarge(maxBytes)
  const boundary = multipartBoundary(getRequestHeader(event, 'content-type') ?? '')
  if (!boundary) unprocessable([{ field: 'files', message: 'send the photos as multipart/form-data' }])
  const parts = parseMultipart(await readBodyUpTo(event, limit, maxBytes), boundary)
  const fields: Record<string, string> = {}
  const files: UploadedFile[] = []
  for (const p of parts) {
    if (p.filename !== undefined) files.push({ name: p.filename || 'photo', data: p.data })
    else fields[p.name] = p.data.toString('utf8')
  }
  if (!files.length) unprocessable([{ field: 'files', message: 'choose at least one photo' }])
  if (files.length > PHOTO_MAX_FILES) unprocessable([{ field: 'files', message: `at most ${PHOTO_MAX_FILES} photos at once` }])
  return { fields, files }
}
