/**
 * Action → event latency at 100 connected sockets (plain tsx script; `npm run bench` runs it).
 * 100 socket.io clients (websocket, signed in as the demo workshop's staff: the workshop room)
 * connect to the built server; the lead then moves one pour 50 times through the real route
 * (PATCH /api/pours/[id]: a transaction, the mould check, an event row, then the broadcast
 * through the PostgreSQL adapter). Each action is timed from sending the request until all 100
 * sockets hold its 'pour.updated' event. Beside it, in the same run, a bare socket.io server
 * (lib/bare-io.ts, also its own process) answers a POST by broadcasting a payload of the same
 * size to 100 clients. Prints p50/p95 of both and the ratio (target: p95 under 50 ms); never asserts.
 */
import { spawn } from 'node:child_process'
import { join } from 'node:path'
import { performance } from 'node:perf_hooks'
import { createInterface } from 'node:readline'
import knex from 'knex'
import { io, type Socket } from 'socket.io-client'
import { benchDatabase, DEMO_PASSWORD, DEMO_USERS, signIn, startBenchServer } from './lib/app'
import { percentile } from './lib/stats'
import { record } from './lib/results'

const SOCKETS = 100
const ACTIONS = 50
const WARMUP = 5
const TARGET_P95_MS = 50
/** A future weekday clear of the demo's pours and of the other benches' days. */
const DAY = '2031-03-04'

interface Live { type: string; id: number; version?: number; row?: unknown }

function connect(url: string, cookie?: string): Promise<Socket> {
  const s = io(url, { path: '/socket.io/', transports: ['websocket'], extraHeaders: cookie ? { cookie } : {}, reconnection: false, forceNew: true })
  return new Promise((resolve, reject) => {
    s.once('connect', () => resolve(s))
    s.once('connect_error', reject)
  })
}

/** Resolves when every socket has seen an event matching `match`, with the time of the last. */
function allReceive(sockets: Socket[], match: (e: Live) => boolean, timeoutMs = 10_000): Promise<number> {
  return new Promise((resolve, reject) => {
    let left = sockets.length
    const timer = setTimeout(() => reject(new Error(`${left} of ${sockets.length} sockets missed the event`)), timeoutMs)
    for (const s of sockets) {
      const on = (e: Live) => {
        if (!match(e)) return
        s.off('live', on)
        if (--left === 0) {
          clearTimeout(timer)
          resolve(performance.now())
        }
      }
      s.on('live', on)
    }
  })
}

async function timeActions(sockets: Socket[], act: (i: number) => Promise<{ match: (e: Live) => boolean; send: () => Promise<number> }>) {
  const total: number[] = []
  const answer: number[] = []
  for (let i = 0; i < WARMUP + ACTIONS; i++) {
    const { match, send } = await act(i)
    const received = allReceive(sockets, match)
    const t0 = performance.now()
    const answeredAt = await send()
    const last = await received
    if (i >= WARMUP) {
      total.push(last - t0)
      answer.push(answeredAt - t0)
    }
    await new Promise(r => setTimeout(r, 20))
  }
  return { total, answer }
}

async function appRun(dbUrl: string) {
  const app = await startBenchServer(dbUrl)
  const sockets: Socket[] = []
  const k = knex({ client: 'pg', connection: dbUrl, pool: { min: 0, max: 1 } })
  try {
    const staff = DEMO_USERS.filter(u => u.role !== 'client')
    const cookies = await Promise.all(staff.map(u => signIn(app.url, u.email, DEMO_PASSWORD)))
    const lead = cookies[staff.findIndex(u => u.role === 'lead')]!
    for (let i = 0; i < SOCKETS; i++) sockets.push(await connect(app.url, cookies[i % cookies.length]))
    const mould = await k('moulds').join('users', 'users.workshop_id', 'moulds.workshop_id')
      .where('users.email', DEMO_USERS[0].email).orderBy('moulds.id').first('moulds.id')
    const json = { 'content-type': 'application/json', 'cookie': lead }
    const created = await fetch(`${app.url}/api/pours`, { method: 'POST', headers: json, body: JSON.stringify({ mouldId: Number(mould.id), slotStart: `${DAY}T09:00:00.000Z` }) })
    if (created.status !== 201) throw new Error(`planning the bench pour failed: ${created.status} ${await created.text()}`)
    const pour = await created.json() as { id: number; version: number }
    let version = pour.version
    let size = 0
    const times = await timeActions(sockets, async (i) => {
      const expect = version + 1
      return {
        match: (e) => {
          if (e.type !== 'pour.updated' || e.id !== pour.id || e.version !== expect) return false
          size = JSON.stringify(e).length
          return true
        },
        send: async () => {
          const r = await fetch(`${app.url}/api/pours/${pour.id}`, { method: 'PATCH', headers: json, body: JSON.stringify({ version, slotStart: `${DAY}T${i % 2 ? '09' : '10'}:00:00.000Z` }) })
          const at = performance.now()
          if (r.status !== 200) throw new Error(`moving the pour failed: ${r.status} ${await r.text()}`)
          version = ((await r.json()) as { version: number }).version
          return at
        },
      }
    })
    await fetch(`${app.url}/api/pours/${pour.id}/void`, { method: 'POST', headers: json, body: JSON.stringify({ version, reason: 'benchmark pour' }) })
    return { ...times, size }
  }
  finally {
    sockets.forEach(s => s.close())
    await k.destroy()
    await app.stop()
  }
}

async function bareRun(payloadBytes: number) {
  const child = spawn(process.execPath, ['--import', 'tsx', join(import.meta.dirname, 'lib/bare-io.ts')], { stdio: ['ignore', 'pipe', 'inherit'] })
  const sockets: Socket[] = []
  try {
    const port = Number((await createInterface({ input: child.stdout! })[Symbol.asyncIterator]().next()).value)
    const url = `http://127.0.0.1:${port}`
    for (let i = 0; i < SOCKETS; i++) sockets.push(await connect(url))
    const filler = 'x'.repeat(Math.max(0, payloadBytes - 60))
    return await timeActions(sockets, async i => ({
      match: e => e.id === i,
      send: async () => {
        const r = await fetch(`${url}/emit`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ type: 'pour.updated', id: i, version: i, row: filler }) })
        const at = performance.now()
        if (r.status !== 204) throw new Error(`bare server answered ${r.status}`)
        return at
      },
    }))
  }
  finally {
    sockets.forEach(s => s.close())
    child.kill('SIGTERM')
  }
}

async function main() {
  const db = await benchDatabase()
  try {
    const app = await appRun(db.url)
    const bare = await bareRun(app.size)
    const [a50, a95, b50, b95] = [percentile(app.total, 50), percentile(app.total, 95), percentile(bare.total, 50), percentile(bare.total, 95)]
    console.log(`action → event at ${SOCKETS} sockets, ${ACTIONS} actions after ${WARMUP} warm-ups, event ~${app.size} bytes`)
    console.log(`  app, pour moved (PATCH)  all sockets: p50 ${a50.toFixed(1)} ms  p95 ${a95.toFixed(1)} ms   (target p95 < ${TARGET_P95_MS} ms)`)
    console.log(`                           HTTP answer: p50 ${percentile(app.answer, 50).toFixed(1)} ms  p95 ${percentile(app.answer, 95).toFixed(1)} ms`)
    console.log(`  bare socket.io broadcast all sockets: p50 ${b50.toFixed(1)} ms  p95 ${b95.toFixed(1)} ms`)
    console.log(`  ratio  p50 ${(a50 / b50).toFixed(2)}x  p95 ${(a95 / b95).toFixed(2)}x`)
    record({ name: `action → event, ${SOCKETS} sockets: p95`, value: `${a95.toFixed(1)} ms`, target: `< ${TARGET_P95_MS} ms`, met: a95 < TARGET_P95_MS, note: `p50 ${a50.toFixed(1)} ms; bare socket.io p50 ${b50.toFixed(1)} ms, p95 ${b95.toFixed(1)} ms` })
  }
  finally {
    db.stop()
  }
}

main().catch((err) => {
  console.error(err)
  process.exit(1)
})
