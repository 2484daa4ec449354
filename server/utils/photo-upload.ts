// Reads a multipart photo upload. h3's readMultipartFormData holds the whole body in memory,
// so the declared Content-Length is checked first: a request larger than the most files we
// accept, each at the size limit, is refused with 413 before anything is read.
import type { H3Event } from 'h3'
import { PHOTO_MAX_FILES } from '#shared/utils/photo-schemas'

export interface UploadedFile { name: string; data: Buffer }
export interface PhotoUpload { fields: Record<string, string>; files: UploadedFile[] }

/** Room for the multipart boundaries and text fields around the files. */
const FORM_OVERHEAD = 256 * 1024

export async function readPhotoUpload(event: H3Event, maxBytes: number): Promise<PhotoUpload> {
  const declared = Number(getRequestHeader(event, 'content-length') ?? 0)
  if (declared > maxBytes * PHOTO_MAX_FILES + FORM_OVERHEAD) {
    throw createError({ statusCode: 413, message: `The upload is too large: at most ${PHOTO_MAX_FILES} photos of ${Math.round(maxBytes / 1048576)} MB each` })
  }
  if (!(getRequestHeader(event, 'content-type') ?? '').startsWith('multipart/form-data')) {
    unprocessable([{ field: 'files', message: 'send the photos as multipart/form-data' }])
  }
  const parts = (await readMultipartFormData(event)) ?? []
  const fields: Record<string, string> = {}
  const files: UploadedFile[] = []
  for (const p of parts) {
    if (p.filename !== undefined) files.push({ name: p.filename || 'photo', data: p.data })
    else if (p.name) fields[p.name] = p.data.toString('utf8')
  }
  if (!files.length) unprocessable([{ field: 'files', message: 'choose at least one photo' }])
  if (files.length > PHOTO_MAX_FILES) unprocessable([{ field: 'files', message: `at most ${PHOTO_MAX_FILES} photos at once` }])
  return { fields, files }
}
