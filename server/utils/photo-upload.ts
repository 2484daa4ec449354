// Reads a multipart photo upload as it streams in (RFC 7578, parsed by @fastify/busboy): each
// file goes to a temp file as it arrives, so a request holds a few stream buffers in memory, not
// its photos (up to PHOTO_MAX_FILES × PHOTO_MAX_BYTES). A file that passes PHOTO_MAX_BYTES is
// cut off there and refused with 413 once the request has been read (the rest is discarded,
// never kept); a body that passes the bound for the whole upload is refused at once.
// Decoding a photo takes hundreds of MB (tests/bench/upload.ts), so only UPLOAD_MAX_CONCURRENCY
// uploads run at once per process; a further one is refused with 503 and Retry-After (RFC 9110
// §15.6.4, §10.2.3) instead of waiting, so the phone that sent it can say "busy, try again"
// at once rather than hang on a queue (OWASP Denial of Service Cheat Sheet: limit concurrency).
import { createWriteStream } from 'node:fs'
import { mkdtemp, rm } from 'node:fs/promises'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { pipeline } from 'node:stream/promises'
import type { Readable } from 'node:stream'
import { Busboy, type BusboyFileStream, type BusboyInstance } from '@fastify/busboy'
import type { H3Event } from 'h3'
import { PHOTO_MAX_FILES } from '#shared/utils/photo-schemas'
import { uploadBodyLimit } from './body-limits'

export interface UploadedFile {
  /** the file name the sender gave (never used as a path) */
  name: string
  /** where its bytes are, in this request's temp folder */
  path: string
  bytes: number
}
export interface PhotoUpload { fields: Record<string, string>; files: UploadedFile[] }

/** Text fields of the upload form (caption, shared, pieceId, pourId) are short. */
const FIELD_MAX_BYTES = 64 * 1024
const FIELDS_MAX = 20
/** Seconds a refused upload is told to wait before trying again. */
export const UPLOAD_RETRY_AFTER_SECONDS = 5

let running = 0

const megabytes = (bytes: number) => Math.round(bytes / 1048576)

function tooLarge(maxBytes: number): never {
  throw createError({ statusCode: 413, message: `The upload is too large: at most ${PHOTO_MAX_FILES} photos of ${megabytes(maxBytes)} MB each` })
}

/** Streams the body into `dir`: text fields in memory, each file to its own temp file. */
function receive(event: H3Event, dir: string, maxBytes: number): Promise<PhotoUpload & { tooLargeFile?: string; tooMany: boolean }> {
  const req = event.node.req
  const limit = uploadBodyLimit(maxBytes)
  return new Promise((resolve, reject) => {
    let busboy: BusboyInstance
    try {
      busboy = new Busboy({
        headers: req.headers as { 'content-type': string },
        // a part is a file when it names one, even an empty name (as the browser sends an empty file input)
        isPartAFile: (_field, _type, fileName) => fileName !== undefined,
        limits: { fileSize: maxBytes, files: PHOTO_MAX_FILES, fields: FIELDS_MAX, fieldSize: FIELD_MAX_BYTES },
      })
    }
    catch {
      reject(createError({ statusCode: 422, message: 'files: send the photos as multipart/form-data', data: { problems: [{ field: 'files', message: 'send the photos as multipart/form-data' }] } }))
      return
    }
    const fields: Record<string, string> = {}
    const files: UploadedFile[] = []
    const writes: Promise<void>[] = []
    const open: Readable[] = []
    let tooLargeFile: string | undefined
    let tooMany = false
    let received = 0
    let settled = false
    const fail = (err: unknown) => {
      if (settled) return
      settled = true
      req.unpipe(busboy)
      // nothing more is read into the parser; what is still in flight is discarded, and the
      // temp files being written are closed
      req.resume()
      for (const s of open) s.destroy()
      reject(err)
    }
    busboy.on('file', (_field: string, stream: BusboyFileStream, fileName: string) => {
      const file: UploadedFile = { name: fileName || 'photo', path: join(dir, String(files.length)), bytes: 0 }
      files.push(file)
      stream.on('data', (chunk: Buffer) => {
        file.bytes += chunk.length
      })
      stream.on('limit', () => {
        tooLargeFile ??= file.name
      })
      open.push(stream)
      const write = pipeline(stream, createWriteStream(file.path))
      // a write that fails after the request was refused has nobody left to tell
      write.catch(() => {})
      writes.push(write)
    })
    busboy.on('field', (name: string, value: string) => {
      fields[name] = value
    })
    busboy.on('filesLimit', () => {
      tooMany = true
    })
    busboy.on('error', () => fail(createError({ statusCode: 400, message: 'The upload broke off or is not a valid multipart form: send the photos again' })))
    busboy.on('finish', () => {
      Promise.all(writes).then(() => {
        if (settled) return
        settled = true
        resolve({ fields, files, tooLargeFile, tooMany })
      }, fail)
    })
    req.on('data', (chunk: Buffer) => {
      received += chunk.length
      // a chunked body (no Content-Length for the request guard to check) is counted as it comes
      if (received > limit) {
        try {
          tooLarge(maxBytes)
        }
        catch (err) {
          fail(err)
        }
      }
    })
    // the sender went away (Node's 'aborted' error, then close): a 4xx nobody reads, not a 500 in the log
    const brokeOff = () => fail(createError({ statusCode: 400, message: 'The upload broke off: send the photos again' }))
    req.on('close', () => {
      if (!req.complete) brokeOff()
    })
    req.on('error', brokeOff)
    req.pipe(busboy)
  })
}

/**
 * Takes one of the upload places, streams the upload to a temp folder, runs `use` on it and
 * removes the folder afterwards, whatever happened. 503 with Retry-After when every place is taken.
 */
export async function withPhotoUpload<T>(event: H3Event, maxBytes: number, use: (upload: PhotoUpload) => Promise<T>): Promise<T> {
  if (running >= appEnv().UPLOAD_MAX_CONCURRENCY) {
    setResponseHeader(event, 'retry-after', UPLOAD_RETRY_AFTER_SECONDS)
    throw createError({ statusCode: 503, message: `The server is busy with other photo uploads: try again in ${UPLOAD_RETRY_AFTER_SECONDS} seconds` })
  }
  running++
  let dir: string | undefined
  try {
    const type = getRequestHeader(event, 'content-type') ?? ''
    if (!/^multipart\/form-data\b/i.test(type)) unprocessable([{ field: 'files', message: 'send the photos as multipart/form-data' }])
    dir = await mkdtemp(join(tmpdir(), 'setline-upload-'))
    const { fields, files, tooLargeFile, tooMany } = await receive(event, dir, maxBytes)
    if (tooLargeFile !== undefined) {
      throw createError({ statusCode: 413, message: `${tooLargeFile}: the file is larger than ${megabytes(maxBytes)} MB`, data: { file: tooLargeFile } })
    }
    if (!files.length) unprocessable([{ field: 'files', message: 'choose at least one photo' }])
    if (tooMany) unprocessable([{ field: 'files', message: `at most ${PHOTO_MAX_FILES} photos at once` }])
    return await use({ fields, files })
  }
  finally {
    running--
    if (dir) await rm(dir, { recursive: true, force: true })
  }
}
