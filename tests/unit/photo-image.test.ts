// The photo pipeline on its own: refusals by content with the right status, EXIF orientation
// applied, every piece of metadata stripped, variants no larger than their bounds.
import { describe, expect, it } from 'vitest'
import sharp from 'sharp'
import { DISPLAY_PX, PhotoRejected, THUMB_PX, processPhoto } from '../../server/utils/photo-image'
import { jpegWithGps, pixelBombPng } from '../setup/photo-fixtures'

const limits = { maxBytes: 15 * 1024 * 1024, maxPixels: 50_000_000 }

async function rejection(input: Buffer, l = limits) {
  try {
    await processPhoto(input, l)
  }
  catch (err) {
    if (err instanceof PhotoRejected) return { status: err.statusCode, message: err.message }
    throw err
  }
  throw new Error('expected a refusal')
}

describe('photo pipeline', () => {
  it('refuses an empty file (422), text (415), an oversize file (413) and a pixel bomb (413)', async () => {
    expect(await rejection(Buffer.alloc(0))).toMatchObject({ status: 422 })
    expect(await rejection(Buffer.from('not a photo, just words\n'.repeat(40)))).toMatchObject({ status: 415, message: /JPEG, PNG or WebP/ })
    const jpeg = await jpegWithGps()
    expect(await rejection(jpeg, { ...limits, maxBytes: 1024 })).toMatchObject({ status: 413 })
    const bomb = await pixelBombPng()
    expect(bomb.length).toBeLessThan(limits.maxBytes)
    expect(await rejection(bomb)).toMatchObject({ status: 413, message: /megapixels/ })
  }, 30_000)

  it('refuses formats other than JPEG, PNG and WebP, and a HEIC file with advice', async () => {
    const gif = await sharp({ create: { width: 8, height: 8, channels: 3, background: '#888' } }).gif().toBuffer()
    expect(await rejection(gif)).toMatchObject({ status: 415, message: /gif files are not accepted/ })
    // the first bytes of an iPhone HEIC: an ftyp box with the heic brand, then no decodable data
    const heic = Buffer.concat([Buffer.from([0, 0, 0, 24]), Buffer.from('ftypheic\0\0\0\0mif1heic', 'latin1'), Buffer.alloc(64)])
    expect(await rejection(heic)).toMatchObject({ status: 415, message: /HEIC/ })
  })

  it('turns the picture upright from EXIF and writes WebP variants with no metadata', async () => {
    const input = await jpegWithGps(4000, 3000)
    const before = await sharp(input).metadata()
    expect(before.orientation).toBe(6)
    expect(before.exif?.toString('latin1')).toContain('FixtureCam')
    const out = await processPhoto(input, limits)
    // Orientation 6 turns a 4000 × 3000 sensor image into a portrait 3000 × 4000 picture
    expect([out.width, out.height]).toEqual([DISPLAY_PX * 3 / 4, DISPLAY_PX])
    for (const buf of [out.thumb, out.display]) {
      const m = await sharp(buf).metadata()
      expect(m.format).toBe('webp')
      expect(m.exif).toBeUndefined()
      expect(m.xmp).toBeUndefined()
      expect(m.iptc).toBeUndefined()
      expect(m.orientation).toBeUndefined()
      expect(buf.includes(Buffer.from('FixtureCam'))).toBe(false)
      expect(Math.max(m.width!, m.height!)).toBeLessThanOrEqual(DISPLAY_PX)
    }
    expect(Math.max((await sharp(out.thumb).metadata()).width!, (await sharp(out.thumb).metadata()).height!)).toBe(THUMB_PX)
  }, 30_000)

  it('never enlarges a small picture', async () => {
    const small = await sharp({ create: { width: 300, height: 200, channels: 3, background: '#abc' } }).png().toBuffer()
    const out = await processPhoto(small, limits)
    expect([out.width, out.height]).toEqual([300, 200])
  })
})
