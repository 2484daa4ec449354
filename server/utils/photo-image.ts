// The photo pipeline: check the bytes are an image sharp can read (by content, never by file
// name), refuse oversize files and decompression bombs, turn the picture upright from its EXIF
// orientation, and write two WebP variants. sharp writes no metadata unless asked to
// (withMetadata / keepMetadata / keepExif), so EXIF, GPS, XMP and ICC text never reach the
// output (sharp docs, "Output options: keepMetadata").
import type { Metadata } from 'sharp'

/**
 * sharp, imported on first use rather than when the server starts: importing it (and its native
 * libvips) costs about 0.25 s of CPU (measured on this project's 2-core machine).
 */
export const loadSharp = () => import('sharp').then(m => m.default)

export interface PhotoLimits { maxBytes: number; maxPixels: number }
export interface PhotoVariants {
  thumb: Buffer
  display: Buffer
  width: number
  height: number
}

export class PhotoRejected extends Error {
  constructor(public statusCode: 413 | 415 | 422, message: string) {
    super(message)
  }
}

const ACCEPTED = new Set(['jpeg', 'png', 'webp', 'heif'])
/** Long edges of the variants: a grid tile on a phone at 2x, and a full-screen view on a laptop. */
export const THUMB_PX = 400
export const DISPLAY_PX = 1600
const HEIC_BRANDS = new Set(['heic', 'heix', 'hevc', 'hevx', 'heim', 'heis', 'mif1', 'msf1'])

/** HEIC photos from phones start with an ISO-BMFF 'ftyp' box naming a HEIF brand (ISO/IEC 23008-12). */
function looksLikeHeic(buf: Buffer) {
  return buf.length > 12 && buf.toString('latin1', 4, 8) === 'ftyp' && HEIC_BRANDS.has(buf.toString('latin1', 8, 12))
}

const heicMessage = 'HEIC photos cannot be read on this server: set the camera to JPEG ("Most Compatible") or share the photo as JPEG'

/** Reads the header only (cheap) and refuses what is not an accepted image or is too large. */
async function checkHeader(input: Buffer, limits: PhotoLimits) {
  if (input.length === 0) throw new PhotoRejected(422, 'the file is empty')
  if (input.length > limits.maxBytes) throw new PhotoRejected(413, `the file is larger than ${Math.round(limits.maxBytes / 1048576)} MB`)
  const sharp = await loadSharp()
  let meta: Metadata
  try {
    // metadata() reads the header only, so no pixel limit is needed here; we compare the
    // declared size ourselves to say why a picture is refused
    meta = await sharp(input, { limitInputPixels: false }).metadata()
  }
  catch {
    throw new PhotoRejected(415, looksLikeHeic(input) ? heicMessage : 'the file is not a photo Setline can read (JPEG, PNG or WebP)')
  }
  if (!meta.format || !ACCEPTED.has(meta.format)) throw new PhotoRejected(415, `${meta.format ?? 'this'} files are not accepted: use JPEG, PNG or WebP`)
  if (meta.format === 'heif' && !sharp.format.heif.input.buffer) throw new PhotoRejected(415, heicMessage)
  if ((meta.width ?? 0) * (meta.height ?? 0) > limits.maxPixels) {
    throw new PhotoRejected(413, `the picture has more than ${Math.round(limits.maxPixels / 1e6)} megapixels`)
  }
}

/**
 * Decodes once to upright pixels at display size (JPEG shrink-on-load keeps this cheap), then
 * encodes the display variant and a thumbnail from those pixels. Raw pixels carry no metadata.
 */
export async function webpVariants(input: Buffer, maxPixels: number) {
  const sharp = await loadSharp()
  const { data, info } = await sharp(input, { limitInputPixels: maxPixels, failOn: 'error' })
    .rotate()
    .resize({ width: DISPLAY_PX, height: DISPLAY_PX, fit: 'inside', withoutEnlargement: true })
    .raw()
    .toBuffer({ resolveWithObject: true })
  const raw = { raw: { width: info.width, height: info.height, channels: info.channels } }
  const [display, thumb] = await Promise.all([
    sharp(data, raw).webp({ quality: 82 }).toBuffer(),
    sharp(data, raw).resize({ width: THUMB_PX, height: THUMB_PX, fit: 'inside', withoutEnlargement: true }).webp({ quality: 75 }).toBuffer(),
  ])
  return { display, thumb, width: info.width, height: info.height }
}

/** Validates one upload and returns its WebP variants, or throws PhotoRejected with a 4xx. */
export async function processPhoto(input: Buffer, limits: PhotoLimits): Promise<PhotoVariants> {
  await checkHeader(input, limits)
  try {
    return await webpVariants(input, limits.maxPixels)
  }
  catch (err) {
    // a header that reads but pixels that do not (truncated or corrupt data)
    if (err instanceof PhotoRejected) throw err
    throw new PhotoRejected(415, `the photo could not be decoded: ${(err as Error).message.split('\n')[0]}`)
  }
}
