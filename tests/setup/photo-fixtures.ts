// Test pictures made with sharp: a JPEG carrying EXIF with GPS and an orientation tag, and a
// small PNG that decodes to far more pixels than the limit (a decompression bomb).
import sharp from 'sharp'

/**
 * A 640 × 480 JPEG with camera EXIF, GPS coordinates and Orientation 6 (rotate 90° clockwise
 * to view), so the pipeline's output must come out 480 wide and carry no metadata at all.
 */
export function jpegWithGps(width = 640, height = 480) {
  return sharp({ create: { width, height, channels: 3, background: { r: 190, g: 170, b: 140 } } })
    .jpeg({ quality: 85 })
    .withMetadata({ orientation: 6 })
    .withExifMerge({
      IFD0: { Make: 'FixtureCam', Model: 'Bench 1', Orientation: '6', Artist: 'Fixture caster' },
      IFD3: { GPSLatitudeRef: 'N', GPSLatitude: '51/1 30/1 0/1', GPSLongitudeRef: 'W', GPSLongitude: '0/1 7/1 0/1' },
    })
    .toBuffer()
}

/** A blank PNG of side × side pixels: a few hundred kB on disk, gigabytes once decoded. */
export function pixelBombPng(side = 10_000) {
  return sharp({ create: { width: side, height: side, channels: 3, background: '#ffffff' }, limitInputPixels: false })
    .toColourspace('b-w')
    .png({ compressionLevel: 9 })
    .toBuffer()
}

export interface UploadFile { name: string; data: Buffer; type?: string }

/** A multipart upload body as the job page sends it. */
export function photoForm(files: UploadFile[], fields: Record<string, string> = {}) {
  const form = new FormData()
  for (const f of files) form.append('files', new Blob([new Uint8Array(f.data)], { type: f.type ?? 'image/jpeg' }), f.name)
  for (const [k, v] of Object.entries(fields)) form.append(k, v)
  return form
}
