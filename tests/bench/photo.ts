/**
 * Photo pipeline benchmark (a plain script, run with tsx; `npm run bench` runs it through run.ts).
 * A synthetic 12-megapixel JPEG (4000 × 3000, EXIF orientation 6) goes through our processPhoto
 * beside a bare sharp pipeline of the same steps without our checks (decode upright at display
 * size, then WebP for the display and thumb variants). Prints the median of several runs after a
 * warm-up and the ratio, against a target of 1.3×; never asserts. The picture carries gaussian
 * noise so the JPEG is the size of a real photo (a flat colour would decode unrealistically fast).
 */
import { performance } from 'node:perf_hooks'
import sharp from 'sharp'
import { DISPLAY_PX, THUMB_PX, processPhoto } from '../../server/utils/photo-image'
import { record } from './lib/results'

const RUNS = 7
const TARGET_RATIO = 1.3
const limits = { maxBytes: 15 * 1024 * 1024, maxPixels: 50_000_000 }

async function bare(input: Buffer) {
  const { data, info } = await sharp(input).rotate()
    .resize({ width: DISPLAY_PX, height: DISPLAY_PX, fit: 'inside' }).raw().toBuffer({ resolveWithObject: true })
  const raw = { raw: { width: info.width, height: info.height, channels: info.channels } }
  return Promise.all([sharp(data, raw).webp({ quality: 82 }).toBuffer(), sharp(data, raw).resize({ width: THUMB_PX, height: THUMB_PX, fit: 'inside' }).webp({ quality: 75 }).toBuffer()])
}

/** A noisy 4000 × 3000 JPEG with orientation 6, roughly the weight of a phone photo. */
function photo() {
  return sharp({ create: { width: 4000, height: 3000, channels: 3, background: '#d9cdb8', noise: { type: 'gaussian', mean: 128, sigma: 30 } } })
    .jpeg({ quality: 85 }).withMetadata({ orientation: 6 }).toBuffer()
}

async function median(fn: () => Promise<unknown>) {
  await fn()
  const times: number[] = []
  for (let i = 0; i < RUNS; i++) {
    const t0 = performance.now()
    await fn()
    times.push(performance.now() - t0)
  }
  times.sort((a, b) => a - b)
  return times[Math.floor(times.length / 2)]!
}

const input = await photo()
console.log(`input: 4000 × 3000 JPEG, ${(input.length / 1024).toFixed(0)} kB; sharp ${sharp.versions.sharp}, libvips ${sharp.versions.vips}, ${RUNS} runs after a warm-up`)
const ours = await median(() => processPhoto(input, limits))
const plain = await median(() => bare(input))
console.log(`processPhoto (ours):   median ${ours.toFixed(0)} ms`)
console.log(`bare sharp, same steps: median ${plain.toFixed(0)} ms`)
console.log(`ratio ${(ours / plain).toFixed(2)}× (target within ${TARGET_RATIO}×)`)
record({ name: 'photo pipeline, 12 MP JPEG vs bare sharp', value: `${(ours / plain).toFixed(2)}×`, target: `≤ ${TARGET_RATIO}×`, met: ours / plain <= TARGET_RATIO, note: `ours ${ours.toFixed(0)} ms, bare ${plain.toFixed(0)} ms` })
