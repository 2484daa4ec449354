// Live updates over socket.io on the app's own port: authenticated from the session
// cookie, one room per workshop, a websocket-only first connection, and two app instances
// on one PostgreSQL passing events to each other (@socket.io/postgres-adapter).
import { afterAll, beforeAll, describe, expect, it, inject } from 'vitest'
import { io, type Socket } from 'socket.io-client'
import type { ChildProcess } from 'node:child_process'
import { call, signIn } from '../setup/http'
import { startAppServer } from '../setup/server'
import { DEMO_PASSWORD, closeTestDb, demo, makeOtherWorkshop } from '../setup/fixtures'

const sockets: Socket[] = []
let second: { url: string; proc: ChildProcess } | undefined

function connect(url: string, cookie?: string): Promise<Socket> {
  const s = io(url, { path: '/socket.io/', transports: ['websocket'], extraHeaders: cookie ? { cookie } : {}, reconnection: false, forceNew: true })
  sockets.push(s)
  return new Promise((resolve, reject) => {
    s.once('connect', () => resolve(s))
    s.once('connect_error', err => reject(err))
  })
}

function nextLive(s: Socket, type: string, timeoutMs = 5000): Promise<any> {
  return new Promise((resolve, reject) => {
    const t = setTimeout(() => reject(new Error(`no ${type} event within ${timeoutMs} ms`)), timeoutMs)
    s.on('live', (e: { type: string }) => {
      if (e.type === type) {
        clearTimeout(t)
        resolve(e)
      }
    })
  })
}

function collect(s: Socket) {
  const seen: unknown[] = []
  s.on('live', e => seen.push(e))
  return seen
}

async function touchSettings(cookie: string, base?: string) {
  const path = '/api/workshop'
  const get = base ? await fetch(base + path, { headers: { cookie } }).then(r => r.json()) : (await call(path, { cookie })).data
  const body = JSON.stringify({ ...get, defaultHumidityPct: get.defaultHumidityPct === 60 ? 61 : 60 })
  const r = base
    ? await fetch(base + path, { method: 'PATCH', headers: { cookie, 'content-type': 'application/json' }, body })
    : await fetch(inject('baseUrl') + path, { method: 'PATCH', headers: { cookie, 'content-type': 'application/json' }, body })
  expect(r.status).toBe(200)
}

let lead = ''
beforeAll(async () => {
  lead = await signIn(demo.lead.email, DEMO_PASSWORD)
})
afterAll(async () => {
  sockets.forEach(s => s.close())
  second?.proc.kill('SIGTERM')
  await closeTestDb()
})

describe('live updates', () => {
  it('refuses a connection without a session', async () => {
    await expect(connect(inject('baseUrl'))).rejects.toThrow(/sign in/)
  })

  it('delivers a change to the same workshop and not to another', async () => {
    const mine = await connect(inject('baseUrl'), lead)
    const other = await makeOtherWorkshop()
    const theirs = await connect(inject('baseUrl'), await signIn(other.lead.email, DEMO_PASSWORD))
    const leaked = collect(theirs)
    const got = nextLive(mine, 'workshop.updated')
    await touchSettings(lead)
    const e = await got
    expect(e.row.name).toBe('Larkspur Ornamental Plaster')
    await new Promise(r => setTimeout(r, 500))
    expect(leaked).toEqual([])
  })

  it('passes events between two app instances sharing one PostgreSQL', async () => {
    second = await startAppServer({ DATABASE_URL: inject('databaseUrl'), NUXT_SESSION_PASSWORD: inject('sessionPassword'), MAIL_FAKE: '0' })
    // the same session works on both instances
    const me = await fetch(`${second.url}/api/auth/me`, { headers: { cookie: lead } })
    expect(me.status).toBe(200)
    const onSecond = await connect(second.url, lead)
    const onFirst = await connect(inject('baseUrl'), lead)
    const viaSecond = nextLive(onSecond, 'workshop.updated')
    await touchSettings(lead) // through the first instance
    expect((await viaSecond).type).toBe('workshop.updated')
    const viaFirst = nextLive(onFirst, 'workshop.updated')
    await touchSettings(lead, second.url) // through the second
    expect((await viaFirst).type).toBe('workshop.updated')
  }, 90_000)
})
