/**
 * 200 concurrent readers (plain tsx script; `npm run bench` runs it through run.ts). Against the
 * built server with the demo workshop, 200 keep-alive connections each read in a loop, one
 * request at a time, for a fixed number of rounds: first the caster's floor (GET
 * /api/floor/today as a caster), then a client's progress page (GET /api/client/jobs/[id]/progress
 * as that client). Prints requests, p50, p95, the slowest and errors per route, and the server's
 * peak resident memory over the whole load run (VmHWM from /proc, reset before the run).
 * Targets: p95 under 100 ms, no errors, peak RSS under 350 MB. Beside them, the same loop
 * against GET /api/health (no session; one `select 1` per request) shows what the HTTP stack
 * and a database round trip cost here. The floor's and the progress reads share their work
 * between readers (one session query, and for progress one membership query, per turn of the
 * event loop for every request of that turn, server/utils/session-checks.ts; the workshop's
 * day and the job's progress read once while nothing changes, server/utils/read-cache.ts), so
 * under this load they can answer more requests a second than the health route, whose
 * `select 1` goes out once per request.
 *
 * With 200 readers always waiting, each request queues behind the others: p95 is about 200
 * divided by the requests per second the server manages (Little's law), so this loop measures
 * capacity. A second, paced run has the 200 readers each read once every PACE_MS (a tablet
 * refreshing), which shows the latency a shop would see at that rate, provided the server keeps up.
 * A plain node:http loop, no load tool: on two shared cores the load generator's own cost
 * matters, and this one is small.
 */
import { Agent, request } from 'node:http'
import { performance } from 'node:perf_hooks'
import { benchDatabase, DEMO_PASSWORD, DEMO_USERS, procKb, signIn, startBenchServer, watchPeakRss } from './lib/app'
import { mb, percentile } from './lib/stats'
import { record } from './lib/results'

const READERS = 200
const ROUNDS = 10
const TARGET_P95_MS = 100
const TARGET_RSS_MB = 350
/** Each paced reader's period: 200 readers every 2 s is 100 requests a second. */
const PACE_MS = 2000
const PACED_ROUNDS = 5

function get(agent: Agent, url: URL, cookie?: string): Promise<number> {
  return new Promise((resolve) => {
    const req = request(url, { agent, headers: cookie ? { cookie, accept: 'application/json' } : { accept: 'application/json' } }, (res) => {
      res.resume()
      res.on('end', () => resolve(res.statusCode ?? 0))
      res.on('error', () => resolve(0))
    })
    req.on('error', () => resolve(0))
    req.end()
  })
}

async function load(base: string | string[], path: string, cookie?: string) {
  const agent = new Agent({ keepAlive: true, maxSockets: READERS })
  // with several instances, reader i reads from instance i mod n: the spread a proxy's ip_hash gives many tablets
  const urls = [base].flat().map(b => new URL(path, b))
  const urlOf = (reader: number) => urls[reader % urls.length]!
  // one request per connection first, so the timed rounds measure reading, not connecting
  await Promise.all(Array.from({ length: READERS }, (_, r) => get(agent, urlOf(r), cookie)))
  const times: number[] = []
  let errors = 0
  const t0 = performance.now()
  await Promise.all(Array.from({ length: READERS }, async (_, r) => {
    for (let i = 0; i < ROUNDS; i++) {
      const t = performance.now()
      const status = await get(agent, urlOf(r), cookie)
      times.push(performance.now() - t)
      if (status !== 200) errors++
    }
  }))
  const seconds = (performance.now() - t0) / 1000
  agent.destroy()
  return { path, requests: times.length, errors, seconds, p50: percentile(times, 50), p95: percentile(times, 95), max: percentile(times, 100) }
}

/** The 200 readers each send one request every PACE_MS, from a random start within the first period. */
async function paced(base: string, path: string, cookie?: string) {
  const agent = new Agent({ keepAlive: true, maxSockets: READERS })
  const url = new URL(path, base)
  await Promise.all(Array.from({ length: READERS }, () => get(agent, url, cookie)))
  const times: number[] = []
  let errors = 0
  const t0 = performance.now()
  await Promise.all(Array.from({ length: READERS }, async () => {
    const offset = Math.random() * PACE_MS
    for (let i = 0; i < PACED_ROUNDS; i++) {
      const wait = t0 + offset + i * PACE_MS - performance.now()
      if (wait > 0) await new Promise(r => setTimeout(r, wait))
      const t = performance.now()
      const status = await get(agent, url, cookie)
      times.push(performance.now() - t)
      if (status !== 200) errors++
    }
  }))
  agent.destroy()
  return { errors, p50: percentile(times, 50), p95: percentile(times, 95), rate: (READERS * 1000) / PACE_MS }
}

async function main() {
  const db = await benchDatabase()
  const app = await startBenchServer(db.url)
  try {
    const email = (key: string) => DEMO_USERS.find(u => u.key === key)!.email
    const caster = await signIn(app.url, email('caster1'), DEMO_PASSWORD)
    const client = await signIn(app.url, email('client1'), DEMO_PASSWORD)
    const jobs = await fetch(`${app.url}/api/client/jobs`, { headers: { cookie: client } }).then(r => r.json()) as { id: number }[]
    const cards = await fetch(`${app.url}/api/floor/today`, { headers: { cookie: caster } }).then(r => r.json()) as { cards: unknown[] }
    const idleKb = procKb(app.pid, 'VmRSS')
    const baseline = await load(app.url, '/api/health')
    const watch = watchPeakRss(app.pid)
    const floor = await load(app.url, '/api/floor/today', caster)
    const progressPath = `/api/client/jobs/${jobs[0]!.id}/progress`
    const progress = await load(app.url, progressPath, client)
    const floorPaced = await paced(app.url, '/api/floor/today', caster)
    const progressPaced = await paced(app.url, progressPath, client)
    const peakKb = watch.stop()
    // the same floor and health loads over two instances on the one database
    const second = await startBenchServer(db.url, { NUXT_SESSION_PASSWORD: app.sessionPassword })
    let twoHealth: Awaited<ReturnType<typeof load>>, twoFloor: Awaited<ReturnType<typeof load>>
    try {
      twoHealth = await load([app.url, second.url], '/api/health')
      twoFloor = await load([app.url, second.url], '/api/floor/today', caster)
    }
    finally {
      await second.stop()
    }
    const rate = (r: { requests: number; seconds: number }) => r.requests / r.seconds
    const share = (f: typeof floor, h: typeof baseline) => `${(100 * rate(f) / rate(h)).toFixed(0)} %`
    console.log(`${READERS} concurrent keep-alive readers × ${ROUNDS} rounds per route; the caster's floor has ${cards.cards.length} cards today`)
    for (const r of [floor, progress, baseline]) {
      console.log(`  ${r.path.padEnd(34)} ${String(r.requests).padStart(5)} requests in ${r.seconds.toFixed(1)} s (${(r.requests / r.seconds).toFixed(0)}/s)  p50 ${r.p50.toFixed(0)} ms  p95 ${r.p95.toFixed(0)} ms  max ${r.max.toFixed(0)} ms  errors ${r.errors}`)
    }
    console.log(`  (target p95 < ${TARGET_P95_MS} ms, no errors)`)
    console.log(`  floor throughput as a share of /api/health: one instance ${share(floor, baseline)} (${rate(floor).toFixed(0)} against ${rate(baseline).toFixed(0)}/s); `
      + `two instances ${share(twoFloor, twoHealth)} (${rate(twoFloor).toFixed(0)} against ${rate(twoHealth).toFixed(0)}/s; floor p95 ${twoFloor.p95.toFixed(0)} ms, errors ${twoFloor.errors + twoHealth.errors})   (goal ≥ 60 %)`)
    console.log(`  paced, each reader once every ${PACE_MS / 1000} s (${floorPaced.rate} requests/s offered):`)
    for (const [path, r] of [['/api/floor/today', floorPaced], [progressPath, progressPaced]] as const) {
      console.log(`  ${path.padEnd(34)} ${String(READERS * PACED_ROUNDS).padStart(5)} requests  p50 ${r.p50.toFixed(0)} ms  p95 ${r.p95.toFixed(0)} ms  errors ${r.errors}`)
    }
    console.log(`  server RSS: ${mb(idleKb)} idle, peak ${mb(peakKb)} during the two routes' load   (target < ${TARGET_RSS_MB} MB)`)
    const routes = [['floor (GET /api/floor/today, caster)', floor, floorPaced], ['client progress (GET …/progress, client)', progress, progressPaced]] as const
    for (const [name, r, p] of routes) {
      record({
        name: `${READERS} readers, ${name}: p95`,
        value: `${r.p95.toFixed(0)} ms, ${r.errors} errors`,
        target: `< ${TARGET_P95_MS} ms, 0 errors`,
        met: r.p95 < TARGET_P95_MS && r.errors === 0,
        note: `${r.requests} requests, p50 ${r.p50.toFixed(0)} ms, ${(r.requests / r.seconds).toFixed(0)}/s (GET /api/health alone: ${(baseline.requests / baseline.seconds).toFixed(0)}/s, p95 ${baseline.p95.toFixed(0)} ms); `
          + `paced at ${p.rate}/s: p50 ${p.p50.toFixed(0)} ms, p95 ${p.p95.toFixed(0)} ms, ${p.errors} errors`,
      })
    }
    record({
      name: 'floor throughput as a share of GET /api/health, one instance / two instances',
      value: `${share(floor, baseline)} / ${share(twoFloor, twoHealth)}`,
      target: '≥ 60 %',
      met: rate(floor) / rate(baseline) >= 0.6,
      note: `one: ${rate(floor).toFixed(0)} against ${rate(baseline).toFixed(0)} requests/s; two (readers spread over both, as the proxy does): ${rate(twoFloor).toFixed(0)} against ${rate(twoHealth).toFixed(0)} requests/s`,
    })
    record({ name: `server peak RSS during the ${READERS}-reader run`, value: mb(peakKb), target: `< ${TARGET_RSS_MB} MB`, met: peakKb / 1024 < TARGET_RSS_MB, note: `${mb(idleKb)} idle before` })
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
