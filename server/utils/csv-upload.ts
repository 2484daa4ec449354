// Reads one CSV file from a multipart form (RFC 7578, parsed by @fastify/busboy as the photo
// upload does) into memory as it streams in, capped at IMPORT_MAX_BYTES: a spreadsheet of
// 5,000 moulds is a few hundred KB, so the cap leaves room and keeps one request from filling
// the server (OWASP Denial of Service Cheat Sheet: limit the size of request bodies).
import { Busboy, type BusboyFileStream } from '@fastify/busboy'
import type { H3Event } from 'h3'
import { IMPORT_MAX_BYTES } from './body-limits'

export interface CsvUpload { fields: Record<string, string>; fileName: string; bytes: Buffer }

const tooLarge = () => createError({ statusCode: 413, message: `file: the file is larger than ${IMPORT_MAX_BYTES / 1048576} MB; split it into smaller files` })

export function readCsvUpload(event: H3Event): Promise<CsvUpload> {
  const req = event.node.req
  const type = getRequestHeader(event, 'content-type') ?? ''
  if (!/^multipart\/form-data\b/i.test(type)) unprocessable([{ field: 'file', message: 'send the file as multipart/form-data' }])
  return new Promise((resolve, reject) => {
    const busboy = new Busboy({
      headers: req.headers as { 'content-type': string },
      isPartAFile: (_field, _type, fileName) => fileName !== undefined,
      limits: { fileSize: IMPORT_MAX_BYTES, files: 1, fields: 10, fieldSize: 1024 },
    })
    const fields: Record<string, string> = {}
    const chunks: Buffer[] = []
    let fileName: string | undefined
    let over = false
    let received = 0
    let settled = false
    const fail = (err: unknown) => {
      if (settled) return
      settled = true
      req.unpipe(busboy)
      req.resume()
      reject(err)
    }
    busboy.on('file', (_field: string, stream: BusboyFileStream, name: string) => {
      fileName = name || 'import.csv'
      stream.on('data', (c: Buffer) => chunks.push(c))
      stream.on('limit', () => {
        over = true
      })
    })
    busboy.on('field', (name: string, value: string) => {
      fields[name] = value
    })
    busboy.on('error', () => fail(createError({ statusCode: 400, message: 'The upload broke off or is not a valid multipart form: send the file again' })))
    busboy.on('finish', () => {
      if (settled) return
      if (over) return fail(tooLarge())
      if (fileName === undefined) return fail(createError({ statusCode: 422, message: 'file: choose a CSV file', data: { problems: [{ field: 'file', message: 'choose a CSV file' }] } }))
      settled = true
      resolve({ fields, fileName, bytes: Buffer.concat(chunks) })
    })
    req.on('data', (chunk: Buffer) => {
      received += chunk.length
      if (received > IMPORT_MAX_BYTES + 64 * 1024) fail(tooLarge())
    })
    req.on('close', () => {
      if (!req.complete) fail(createError({ statusCode: 400, message: 'The upload broke off: send the file again' }))
    })
    req.pipe(busboy)
  })
}
