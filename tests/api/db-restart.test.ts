// PostgreSQL restarting under running app instances: the socket adapter's pool loses its
// connections (the LISTEN one included) and must log that and carry on, not throw an
// uncaught exception; once the database is back, live updates pass between two instances
// again. Its own cluster, so restarting it does not disturb the other API tests.
import { mkdtempSync, chmodSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { randomBytes } from 'node:crypto'
import type { ChildProcess } from 'node:child_process'
import { afterAll, describe, expect, it } from 'vitest'
import { io, type Socket } from 'socket.io-client'
import { upCluster, downCluster, type DbTarget } from '../../db/local/cluster'
import { ownSeededCluster } from '../setup/throwaway-db'
import { startAppServer } from '../setup/server'
import { DEMO_PASSWORD, demo } from '../setup/fixtures'

const base = mkdtempSync(join(tmpdir(), 'setline-restart-'))
chmodSync(base, 0o755)
let target: DbTarget | undefined
const procs: ChildProcess[] = []
let socket: Socket | undefined

afterAll(() => {
  socket?.close()
  procs.forEach(p => p.kill('SIGTERM'))
  if (target) downCluster(target)
  rmSync(base, { recursive: true, force: true })
})

async function signInAt(url: string) {
  const r = await fetch(`${url}/api/auth/login`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ email: demo.lead.email, password: DEMO_PASSWORD }) })
  expect(r.status).toBe(200)
  return r.headers.getSetCookie().find(c => c.startsWith('setline-session='))!.split(';')[0]!
}

/**
 * Changes the workshop's settings through one instance; the status (a 5xx while the database
 * is away, 0 when the request itself failed: a kept-alive connection the app closed meanwhile).
 */
async function touchSettings(url: string, cookie: string) {
  try {
    const get = await fetch(`${url}/api/workshop`, { headers: { cookie } })
    if (!get.ok) return get.status
    const now = await get.json()
    const r = await fetch(`${url}/api/workshop`, {
      method: 'PATCH', headers: { cookie, 'content-type': 'application/json' },
      body: JSON.stringify({ ...now, defaultHumidityPct: now.defaultHumidityPct === 60 ? 61 : 60 }),
    })
    return r.status
  }
  catch {
    return 0
  }
}

/** Whether a workshop.updated reaches the socket within `ms` (false when it does not). */
function heard(s: Socket, ms: number) {
  return new Promise<boolean>((resolve) => {
    const t = setTimeout(() => {
      s.off('live', on)
      resolve(false)
    }, ms)
    function on(e: { type: string }) {
      if (e.type !== 'workshop.updated') return
      clearTimeout(t)
      s.off('live', on)
      resolve(true)
    }
    s.on('live', on)
  })
}

describe('PostgreSQL restarts under two app instances', () => {
  it('the apps log the lost connections, throw no uncaught exception, and live updates cross between them again', async () => {
    target = await ownSeededCluster(base, 'restart')
    const env = { DATABASE_URL: target.url, NUXT_SESSION_PASSWORD: randomBytes(24).toString('hex') }
    const output: string[] = []
    const a = await startAppServer(env, output)
    procs.push(a.proc)
    const b = await startAppServer(env, output)
    procs.push(b.proc)
    const cookie = await signInAt(a.url)
    socket = io(b.url, { path: '/socket.io/', transports: ['websocket'], extraHeaders: { cookie }, reconnection: false, forceNew: true })
    await new Promise((resolve, reject) => {
      socket!.once('connect', () => resolve(undefined))
      socket!.once('connect_error', reject)
    })
    // before: a change through A reaches the socket on B (through PostgreSQL's LISTEN/NOTIFY)
    const before = heard(socket, 10_000)
    expect(await touchSettings(a.url, cookie)).toBe(200)
    expect(await before).toBe(true)

    downCluster(target)
    upCluster(target)

    // after: B's adapter listens again once it has a new connection (it retries every ~2 s);
    // a change made before that is not replayed, so try again until one gets through
    let through = false
    const until = Date.now() + 60_000
    while (!through && Date.now() < until) {
      const next = heard(socket, 3000)
      const status = await touchSettings(a.url, cookie)
      through = (await next) && status === 200
    }
    expect(through).toBe(true)
    expect(socket.connected).toBe(true)
    expect([a.proc.exitCode, b.proc.exitCode]).toEqual([null, null])
    const log = output.join('')
    expect(log).toMatch(/socket\.io adapter: database connection lost/)
    expect(log).not.toMatch(/\[uncaughtException\]|\[unhandledRejection\]/)
  }, 180_000)
})
