// Live updates over socket.io on the app's own port: authenticated from the session
// cookie, one room per workshop, a websocket-only first connection, and two app instances
// on one PostgreSQL passing events to each other (@socket.io/postgres-adapter): a pour moved
// through one reaches a tablet connected to the other, and a session from either works on both.
// The floor's kept answers (server/utils/read-cache.ts) follow a change made on the other
// instance at once: on its live event, and after a write that sends none.
// A page's first connection hears whether an event went to its rooms after the page was read
// (server/utils/live-since.ts), from this instance or the other.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { io, type Socket } from 'socket.io-client'
import type { ChildProcess } from 'node:child_process'
import { call, signIn } from '../setup/http'
import { startAppServer } from '../setup/server'
import { DEMO_PASSWORD, closeTestDb, demo, makeOtherWorkshop } from '../setup/fixtures'
import { boardFixture, zoneAwayFromMidnight } from '../setup/board-fixtures'
import { testContext } from '../setup/context'
import { LIVE_SINCE, type LiveSinceAnswer } from '#shared/types/live'
import { SKEW_MS } from '../../server/utils/live-since'

const sockets: Socket[] = []
let second: { url: string; proc: ChildProcess } | undefined

function connect(url: string, cookie?: string, auth: { since?: number } = {}): Promise<Socket> {
  const s = io(url, { path: '/socket.io/', transports: ['websocket'], extraHeaders: cookie ? { cookie } : {}, reconnection: false, forceNew: true, auth })
  sockets.push(s)
  return new Promise((resolve, reject) => {
    s.once('connect', () => resolve(s))
    s.once('connect_error', err => reject(err))
  })
}

/** Connects as a page read at `since` would, and gives the server's word on missed events. */
async function connectSince(url: string, cookie: string, since?: number): Promise<LiveSinceAnswer> {
  const s = io(url, { path: '/socket.io/', transports: ['websocket'], extraHeaders: { cookie }, reconnection: false, forceNew: true, auth: since === undefined ? {} : { since } })
  sockets.push(s)
  const heard = new Promise<LiveSinceAnswer>((resolve, reject) => {
    const t = setTimeout(() => reject(new Error(`no ${LIVE_SINCE} answer within 5 s`)), 5000)
    s.once(LIVE_SINCE, (a: LiveSinceAnswer) => {
      clearTimeout(t)
      resolve(a)
    })
    s.once('connect_error', reject)
  })
  const answer = await heard
  s.close()
  return answer
}

/**
 * A page's read time later than every event so far by more than the server's clock allowance,
 * returned once the clock has reached the start of that allowance, so any event from then on
 * counts for it (the server shares this machine's clock).
 */
async function readAfterEverything() {
  const since = Date.now() + SKEW_MS + 20
  while (Date.now() < since - SKEW_MS) await new Promise(r => setTimeout(r, since - SKEW_MS - Date.now()))
  return since
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
    : await fetch(testContext().baseUrl + path, { method: 'PATCH', headers: { cookie, 'content-type': 'application/json' }, body })
  expect(r.status).toBe(200)
}

/** The second app instance on the same database and session secret, started once for the file. */
async function secondInstance() {
  // answers kept for a minute there: a floor read that follows a change sooner shows the change was dropped, not timed out
  second ??= await startAppServer({ DATABASE_URL: testContext().databaseUrl, NUXT_SESSION_PASSWORD: testContext().sessionPassword, MAIL_FAKE: '0', READ_CACHE_MS: '60000' })
  return second
}

/** Signs in on a given instance (signIn() of tests/setup/http always uses the first). */
async function signInAt(base: string, email: string) {
  const r = await fetch(`${base}/api/auth/login`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ email, password: DEMO_PASSWORD }) })
  expect(r.status).toBe(200)
  return r.headers.getSetCookie().find(c => c.startsWith('setline-session='))!.split(';')[0]!
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
    await expect(connect(testContext().baseUrl)).rejects.toThrow(/sign in/)
  })

  it('delivers a change to the same workshop and not to another', async () => {
    const mine = await connect(testContext().baseUrl, lead)
    const other = await makeOtherWorkshop()
    const theirs = await connect(testContext().baseUrl, await signIn(other.lead.email, DEMO_PASSWORD))
    const leaked = collect(theirs)
    const got = nextLive(mine, 'workshop.updated')
    await touchSettings(lead)
    const e = await got
    expect(e.row.name).toBe('Larkspur Ornamental Plaster')
    // the other workshop's own change comes after ours on its socket: once it arrived, a leaked
    // event of ours would have arrived before it
    const theirsArrived = nextLive(theirs, 'workshop.updated')
    await touchSettings(await signIn(other.lead.email, DEMO_PASSWORD))
    const theirEvent = await theirsArrived
    expect(theirEvent.row.name).toMatch(/^Other workshop/)
    expect(leaked).toEqual([theirEvent])
  })

  it('passes events between two app instances sharing one PostgreSQL', async () => {
    const other = await secondInstance()
    // the same session works on both instances
    const me = await fetch(`${other.url}/api/auth/me`, { headers: { cookie: lead } })
    expect(me.status).toBe(200)
    const onSecond = await connect(other.url, lead)
    const onFirst = await connect(testContext().baseUrl, lead)
    const viaSecond = nextLive(onSecond, 'workshop.updated')
    await touchSettings(lead) // through the first instance
    expect((await viaSecond).type).toBe('workshop.updated')
    const viaFirst = nextLive(onFirst, 'workshop.updated')
    await touchSettings(lead, other.url) // through the second
    expect((await viaFirst).type).toBe('workshop.updated')
  }, 90_000)

  it('tells a page\'s first connection whether its rooms heard an event after the page was read, on either instance', async () => {
    const other = await makeOtherWorkshop()
    const theirLead = await signIn(other.lead.email, DEMO_PASSWORD)
    // a page read after every event so far (clock allowance included), then a change of ours:
    // missed, whichever instance sent the change
    const before = await readAfterEverything()
    await touchSettings(lead)
    expect(await connectSince(testContext().baseUrl, lead, before)).toEqual({ missed: true })
    const second = await secondInstance()
    const beforeThere = await readAfterEverything()
    // the change reaches this instance through PostgreSQL: once a socket here heard it
    const arrived = nextLive(await connect(testContext().baseUrl, lead), 'workshop.updated')
    await touchSettings(lead, second.url)
    await arrived
    expect(await connectSince(testContext().baseUrl, lead, beforeThere)).toEqual({ missed: true })
    // then only the other workshop changes: ours missed nothing, theirs did
    const since = await readAfterEverything()
    await touchSettings(theirLead)
    expect(await connectSince(testContext().baseUrl, lead, since)).toEqual({ missed: false })
    expect(await connectSince(testContext().baseUrl, theirLead, since)).toEqual({ missed: true })
    // a connection that names no time (or not a number) cannot be vouched for
    expect(await connectSince(testContext().baseUrl, lead)).toEqual({ missed: true })
    expect(await connectSince(testContext().baseUrl, lead, 'soon' as unknown as number)).toEqual({ missed: true })
  }, 90_000)

  it('a pour moved through one instance reaches a caster\'s tablet on the other; sessions from either work on both', async () => {
    const b = await secondInstance()
    const a = testContext().baseUrl
    // a session made on B works on A, as the lead's session from A works on B (above)
    const caster = await signInAt(b.url, demo.caster1.email)
    const meOnA = await fetch(`${a}/api/auth/me`, { headers: { cookie: caster } })
    expect(meOnA.status).toBe(200)
    expect((await meOnA.json()).email).toBe(demo.caster1.email)
    const tablet = await connect(b.url, caster)
    const fx = await boardFixture('realtime')
    const mouldId = await fx.mould()
    const json = { 'cookie': lead, 'content-type': 'application/json' }
    const planned = await fetch(`${a}/api/pours`, { method: 'POST', headers: json, body: JSON.stringify({ mouldId, slotStart: '2027-06-01T09:00:00.000Z', casterId: fx.casterId }) })
    expect(planned.status).toBe(201)
    const pour = await planned.json()
    const moved = new Promise<any>((resolve, reject) => {
      const t = setTimeout(() => reject(new Error('no pour.updated for the moved pour on instance B within 5 s')), 5000)
      tablet.on('live', (e: { type: string; id: number }) => {
        if (e.type === 'pour.updated' && e.id === pour.id) {
          clearTimeout(t)
          resolve(e)
        }
      })
    })
    const r = await fetch(`${a}/api/pours/${pour.id}`, { method: 'PATCH', headers: json, body: JSON.stringify({ version: pour.version, slotStart: '2027-06-01T11:00:00.000Z' }) })
    expect(r.status).toBe(200)
    const e = await moved
    expect(e).toMatchObject({ version: pour.version + 1, row: { id: pour.id, mouldId, slotStart: '2027-06-01T11:00:00.000Z' } })
  }, 90_000)

  it('a caster\'s floor read on one instance shows a change made on the other at once: on its live event, and after a write that sends none', async () => {
    const b = await secondInstance()
    const a = testContext().baseUrl
    const fx = await boardFixture('floor-kept')
    // before any floor read of this file: pours starting now are on the workshop's today
    await fx.k('workshops').where({ id: fx.workshopId }).update({ timezone: zoneAwayFromMidnight() })
    const caster = await signInAt(b.url, demo.caster1.email)
    const other = await signInAt(b.url, demo.caster2.email)
    const floorOnB = async (cookie = caster) => {
      const r = await fetch(`${b.url}/api/floor/today`, { headers: { cookie } })
      expect(r.status).toBe(200)
      return await r.json() as { cards: { pour: { id: number; slotStart: string }; lots: { lotCode: string }[] }[] }
    }
    await floorOnB() // kept on B from now on (READ_CACHE_MS there is a minute)
    const tablet = await connect(b.url, caster)
    const json = { 'cookie': lead, 'content-type': 'application/json' }
    const mouldId = await fx.mould()
    const itemId = await fx.item(await fx.job(), mouldId)
    const slotStart = new Date(Math.floor(Date.now() / 60_000) * 60_000).toISOString()

    // planned on A: the caster's tablet on B reads again on the event, and sees it
    const created = nextLive(tablet, 'pour.created')
    const planned = await fetch(`${a}/api/pours`, { method: 'POST', headers: json, body: JSON.stringify({ mouldId, slotStart, jobItemId: itemId, casterId: fx.casterId }) })
    expect(planned.status).toBe(201)
    const pour = await planned.json()
    await created
    expect((await floorOnB()).cards.map(c => c.pour.id)).toContain(pour.id)
    // and only the caster it is for
    expect((await floorOnB(other)).cards.map(c => c.pour.id)).not.toContain(pour.id)

    // moved on A: read again on the event, the card has the new slot
    const later = new Date(Date.parse(slotStart) + 30 * 60_000).toISOString()
    const moved = nextLive(tablet, 'pour.updated')
    const r = await fetch(`${a}/api/pours/${pour.id}`, { method: 'PATCH', headers: json, body: JSON.stringify({ version: pour.version, slotStart: later }) })
    expect(r.status).toBe(200)
    await moved
    expect((await floorOnB()).cards.find(c => c.pour.id === pour.id)?.pour.slotStart).toBe(later)

    // the control: a lot put straight into the database (no request, so nothing is dropped) is not
    // seen on B yet, which shows B answers from what it kept. The other API files run beside this
    // one on A, and a write there without a session (a sign-in) drops every workshop's answers on
    // every instance; so the control is tried again with a new lot if such a drop fell between the
    // two reads, and must hold on one of five tries.
    const lotsOf = async () => (await floorOnB()).cards.find(c => c.pour.id === pour.id)!.lots.map(l => l.lotCode)
    const quiet: string[] = []
    let keptOnB = false
    for (let i = 0; i < 5 && !keptOnB; i++) {
      await lotsOf() // kept on B
      quiet.push(`${fx.tag}-QUIET${i}`)
      await fx.lot({ lot_code: quiet.at(-1) })
      keptOnB = !(await lotsOf()).includes(quiet.at(-1)!)
    }
    expect(keptOnB, 'B answered a read from what it kept (on one of five tries)').toBe(true)
    // a lot received on A sends no live event; its write drops the kept answers on B too
    const received = `${fx.tag}-RECEIVED`
    const lot = await fetch(`${a}/api/lots`, { method: 'POST', headers: json, body: JSON.stringify({ gradeId: fx.gradeId, lotCode: received, bagsReceived: 4, bagKg: 25, receivedOn: '2026-01-02' }) })
    expect(lot.status).toBe(201)
    await expect.poll(lotsOf, { timeout: 10_000 }).toEqual(expect.arrayContaining([...quiet, received]))
  }, 90_000)
})
