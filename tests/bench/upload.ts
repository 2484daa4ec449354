/**
 * Server memory while it takes a 50-megapixel photo (plain tsx script; `npm run bench` runs it).
 * A synthetic 8660 × 5773 JPEG (just under the 50 MP limit, EXIF orientation 6 as a phone sets
 * it, noisy so it weighs what a camera file does and stays under the 15 MB size limit) goes
 * through the real upload route (POST /api/jobs/[id]/photos, multipart, as the lead) of a built
 * server of its own. The server's peak resident memory is read from /proc (VmHWM, reset just
 * before each upload). Goal: under 600 MB. Prints figures; never asserts.
 */
import { existsSync, readFileSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { performance } from 'node:perf_hooks'
import sharp from 'sharp'
import { photoForm } from '../setup/photo-fixtures'
import { benchDatabase, DEMO_PASSWORD, DEMO_USERS, procKb, signIn, startBenchServer, watchPeakRss } from './lib/app'
import { mb } from './lib/stats'
import { record } from './lib/results'

const WIDTH = 8660
const HEIGHT = 5773
const UPLOADS = 3
const GOAL_MB = 600

/** The test picture, made once and kept in the temp folder (making it takes half a minute). */
async function photo(): Promise<Buffer> {
  const file = join(tmpdir(), `setline-bench-${WIDTH}x${HEIGHT}-v1.jpg`)
  if (existsSync(file)) return readFileSync(file)
  const jpeg = await sharp({ create: { width: WIDTH, height: HEIGHT, channels: 3, background: '#d9cdb8', noise: { type: 'gaussian', mean: 128, sigma: 14 } } })
    .jpeg({ quality: 85 }).withMetadata({ orientation: 6 }).toBuffer()
  writeFileSync(file, jpeg)
  return jpeg
}

async function main() {
  const input = await photo()
  const db = await benchDatabase()
  const app = await startBenchServer(db.url)
  try {
    const lead = await signIn(app.url, DEMO_USERS.find(u => u.key === 'lead')!.email, DEMO_PASSWORD)
    const jobs = await fetch(`${app.url}/api/jobs`, { headers: { cookie: lead } }).then(r => r.json()) as { id: number }[] | { rows: { id: number }[] }
    const jobId = (Array.isArray(jobs) ? jobs : jobs.rows)[0]!.id
    const idleKb = procKb(app.pid, 'VmRSS')
    const peaks: number[] = []
    const times: number[] = []
    for (let i = 0; i < UPLOADS; i++) {
      const watch = watchPeakRss(app.pid)
      const t0 = performance.now()
      const r = await fetch(`${app.url}/api/jobs/${jobId}/photos`, { method: 'POST', headers: { cookie: lead }, body: photoForm([{ name: 'ceiling-rose.jpg', data: input }], { caption: 'Benchmark photo' }) })
      const body = await r.text()
      times.push(performance.now() - t0)
      peaks.push(watch.stop())
      if (r.status !== 201) throw new Error(`upload answered ${r.status}: ${body}`)
    }
    const peak = Math.max(...peaks)
    console.log(`50 MP upload: ${WIDTH} × ${HEIGHT} JPEG (${(WIDTH * HEIGHT / 1e6).toFixed(1)} MP), ${(input.length / 1048576).toFixed(1)} MB, ${UPLOADS} uploads one after another`)
    console.log(`  answered in ${times.map(t => `${(t / 1000).toFixed(1)} s`).join(', ')}`)
    console.log(`  server RSS ${mb(idleKb)} idle; peak per upload ${peaks.map(mb).join(', ')}   (goal < ${GOAL_MB} MB)`)
    record({ name: 'server peak RSS, 50 MP photo upload', value: mb(peak), target: `< ${GOAL_MB} MB`, met: peak / 1024 < GOAL_MB, note: `${mb(idleKb)} idle; ${(input.length / 1048576).toFixed(1)} MB JPEG answered in ${(Math.min(...times) / 1000).toFixed(1)} s at best` })
  }
  finally {
    await app.stop()
    db.stop()
  }
}

main().catch((err) => {
  console.error(err)
  process.exit(1)
})
