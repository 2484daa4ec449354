// How large a request body may be, and of which type, per API route. The request guard
// (server/middleware/00.request-guard.ts) applies these before any route reads a body: an
// unbounded body read before sign-in lets one request fill the server's memory (OWASP
// Denial of Service Cheat Sheet, "limit the size of request bodies"; OWASP API Security Top 10
// 2023, API4 "Unrestricted Resource Consumption").
import { PHOTO_MAX_FILES } from '#shared/utils/photo-schemas'

/** Every JSON body, unless its route is listed below: the largest form Setline sends is a few KB. */
export const JSON_BODY_MAX_BYTES = 64 * 1024

/**
 * Routes that take more. The planner's accept sends up to 2000 pours of about 110 bytes each
 * ({"jobItemId":…,"mouldId":…,"slotStart":"2027-09-16T09:00:00.000Z","casterId":…}): 220 KB
 * at most, so 512 KiB leaves room for long ids and whitespace.
 */
const LARGE_JSON: { method: string; path: RegExp; max: number }[] = [
  { method: 'POST', path: /^\/api\/planner\/accept$/, max: 512 * 1024 },
  // a proof of delivery carries the signature as a PNG data URL (DELIVERY_SIGNATURE_MAX_CHARS, 200 000)
  { method: 'POST', path: /^\/api\/deliveries\/[^/]+\/proof$/, max: 256 * 1024 },
]

/** Routes that take a file as multipart/form-data (RFC 7578), and nothing else does. */
const MULTIPART: { method: string; path: RegExp }[] = [
  { method: 'POST', path: /^\/api\/jobs\/[^/]+\/photos$/ },
  { method: 'POST', path: /^\/api\/import\/[a-z-]+\/(preview|confirm)$/ },
]

/** A CSV import file (server/utils/csv-upload.ts): 5,000 moulds measure about 400 KB. */
export const IMPORT_MAX_BYTES = 4 * 1024 * 1024

/** Room for the multipart boundaries and text fields around the files of one upload. */
export const FORM_OVERHEAD_BYTES = 256 * 1024

export function jsonBodyLimit(method: string, path: string): number {
  return LARGE_JSON.find(r => r.method === method && r.path.test(path))?.max ?? JSON_BODY_MAX_BYTES
}

export function takesMultipart(method: string, path: string): boolean {
  return MULTIPART.some(r => r.method === method && r.path.test(path))
}

/** The most one photo upload may carry: every file at the size limit, and the form around them. */
export function uploadBodyLimit(photoMaxBytes: number): number {
  return photoMaxBytes * PHOTO_MAX_FILES + FORM_OVERHEAD_BYTES
}
