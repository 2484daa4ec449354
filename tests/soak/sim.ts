// The soak simulator: a working week of an invented shop, compressed, against the built app
// (.output) on a PostgreSQL of its own, with faults on a seeded schedule; at the end the
// invariants are read from the database and from the simulated tablets' own records.
//
// How time is compressed: each simulated day is a real calendar day ahead of today (day 0 is
// tomorrow), planned by the lead on the board, and its steps are taken as fast as the tablets
// can send them. The server allows that: a floor step may be taken before its pour's slot (an
// early demould is asked about on the tablet, not refused; services/floor-actions.ts), and the
// only clocks it holds a step to are "not in the future" and "not before the previous step"
// (services/actions.ts actionTime). A step taken while "offline" carries the time it was tapped,
// as the real outbox sends it (app/stores/outbox.ts).
//
// Everything talks to 127.0.0.1 only: the app's two instances, the SMTP fake this process runs
// (so a killed app instance does not take the record of sent mail with it) and the database.
// Every loop is bounded in count and by the run's deadline.
import { spawn, type ChildProcess } from 'node:child_process'
import { chmodSync, mkdirSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join, resolve } from 'node:path'
import { randomBytes, randomUUID } from 'node:crypto'
import knex, { type Knex } from 'knex'
import sharp from 'sharp'
import { io, type Socket } from 'socket.io-client'
import { downCluster, type DbTarget } from '../../db/local/cluster'
import { DEMO_PASSWORD, DEMO_USERS } from '../../db/seeds/demo-people'
import { startSmtpFake, type SmtpFake } from '../../server/utils/smtp-fake'
import { ownSeededCluster } from '../setup/throwaway-db'
import { startAppServer } from '../setup/server'
import { procKb } from '../bench/lib/app'
import { percentile } from '../bench/lib/stats'
import { prng, type Prng } from './prng'
import { leanPour } from '#shared/utils/board-lean'
import type { BoardPourFields, BoardPourRow } from '#shared/types/board'

export interface SoakOptions {
  seed: number
  /** simulated working days */
  days: number
  /** caster tablets (6–8 in the issue) */
  casters: number
  finishers: number
  /** new pieces ordered per simulated day */
  piecesPerDay: number
  /** the run stops by itself after this long, finished or not */
  maxMinutes: number
  log?: (line: string) => void
}

export interface Invariant { name: string; held: boolean; detail: string }

export interface SoakReport {
  seed: number
  days: number
  seconds: number
  actionsPerDay: number[]
  faults: Record<FaultKind, number>
  queuedOffline: number
  replayed: number
  retried: number
  refusals: number
  longestWaitMs: number
  p95ActionMs: number
  /** photos taken at demould: stored, uploads sent again after no answer, pours holding more than one */
  photos: { uploaded: number; retried: number; poursWithMore: number }
  mailsSent: number
  statuses: Record<string, number>
  memory: { warmKb: number; endKb: number; peakKb: number }
  invariants: Invariant[]
  finished: boolean
}

export type FaultKind = 'tablet drop' | 'app killed' | 'database restarted' | 'mail refused'
const FAULT_KINDS: FaultKind[] = ['tablet drop', 'app killed', 'database restarted', 'mail refused']

const root = resolve(import.meta.dirname, '../..')
const sleep = (ms: number) => new Promise(r => setTimeout(r, ms))
const STEP_EVENT: Record<string, string> = { start_mixing: 'pour.mixing', poured: 'pour.poured', demoulded: 'pour.demoulded' }
const NEXT_STEP: Record<string, string | undefined> = { planned: 'start_mixing', mixing: 'poured', setting: 'demoulded' }
const STEP_TO: Record<string, string> = { start_mixing: 'mixing', poured: 'setting', demoulded: 'demoulded' }
/** A request's own bound: a server that answers nothing in this long counts as gone for that try. */
const REQUEST_TIMEOUT_MS = 15_000

// ── the app instances behind one front (a tablet goes to its own instance, else the other) ──

interface Instance { name: 'A' | 'B'; url: string; proc: ChildProcess | null; up: boolean; inflight: number; output: string[] }

interface Delivered { to: string; subject: string; text: string; messageId: string | null }
interface Answer { status: number; data: any; replayed: boolean; ms: number }

class Shop {
  instances: Record<'A' | 'B', Instance> = {
    A: { name: 'A', url: '', proc: null, up: false, inflight: 0, output: [] },
    B: { name: 'B', url: '', proc: null, up: false, inflight: 0, output: [] },
  }

  statuses: Record<string, number> = {}
  problems: string[] = []
  dbDown = false
  constructor(public env: Record<string, string>, public deadline: number) {}

  async start(name: 'A' | 'B') {
    const inst = this.instances[name]
    const started = await startAppServer(this.env, inst.output, false)
    Object.assign(inst, { url: started.url, proc: started.proc, up: true })
    started.proc.once('exit', () => {
      if (inst.proc === started.proc) inst.up = false
    })
  }

  urlFor(pref: 'A' | 'B') {
    const own = this.instances[pref]
    const other = this.instances[pref === 'A' ? 'B' : 'A']
    return own.up ? own : other.up ? other : own
  }

  /** One request; status 0 when the connection failed or was cut (the caller retries). */
  async call(pref: 'A' | 'B', cookie: string, method: string, path: string, body?: unknown, signal?: AbortSignal): Promise<Answer> {
    const inst = this.urlFor(pref)
    const t = performance.now()
    inst.inflight++
    try {
      const signals = [AbortSignal.timeout(REQUEST_TIMEOUT_MS), ...(signal ? [signal] : [])]
      const res = await fetch(inst.url + path, {
        method, signal: AbortSignal.any(signals),
        headers: { accept: 'application/json', cookie, ...(body === undefined ? {} : { 'content-type': 'application/json' }) },
        body: body === undefined ? undefined : JSON.stringify(body),
      })
      const text = await res.text()
      let data: any = text
      try {
        data = text ? JSON.parse(text) : null
      }
      catch { /* not JSON */ }
      this.statuses[res.status] = (this.statuses[res.status] ?? 0) + 1
      // a 503 is the promised answer while the database is away; any other 5xx is a defect
      if (res.status >= 500 && res.status !== 503) this.problems.push(`${method} ${path} → ${res.status}: ${text.slice(0, 300)}`)
      return { status: res.status, data, replayed: res.headers.get('x-setline-replayed') === '1', ms: performance.now() - t }
    }
    catch {
      this.statuses['no answer'] = (this.statuses['no answer'] ?? 0) + 1
      return { status: 0, data: null, replayed: false, ms: performance.now() - t }
    }
    finally {
      inst.inflight--
    }
  }

  /** A request retried (same body) through outages until it is answered with something other than 0/503. */
  async steady(pref: 'A' | 'B', cookie: string, method: string, path: string, body?: unknown): Promise<Answer> {
    for (let i = 0; i < 400 && Date.now() < this.deadline; i++) {
      const r = await this.call(pref, cookie, method, path, body)
      if (r.status !== 0 && r.status !== 503) return r
      await sleep(Math.min(1500, 100 * 2 ** Math.min(i, 4)))
    }
    return { status: 0, data: null, replayed: false, ms: 0 }
  }
}

async function signIn(shop: Shop, email: string) {
  for (let i = 0; i < 20; i++) {
    const inst = shop.urlFor('B')
    const r = await fetch(`${inst.url}/api/auth/login`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ email, password: DEMO_PASSWORD }) })
    const cookie = r.headers.getSetCookie().find(c => c.startsWith('setline-session='))?.split(';')[0]
    if (r.status === 200 && cookie) return cookie
    await sleep(300)
  }
  throw new Error(`soak: sign-in as ${email} failed`)
}

// ── the tablets' records ──

interface TabletAction {
  id: string
  who: string
  userId: number
  entity: 'pour' | 'piece' | 'dispatch'
  entityId: number
  kind: string
  version?: number
  body: Record<string, unknown>
  tappedAt: number
  offline: boolean
  attempts: number
  replayed: boolean
  settledAt?: number
  status?: number
  day: number
}

interface PourView { state: string; version: number; plasterKg: number; waterKg: number; jobId: number }

class CasterTablet {
  online = true
  socket: Socket | undefined
  queue: TabletAction[] = []
  done: TabletAction[] = []
  view = new Map<number, PourView>()
  work: number[] = []
  abort = new AbortController()
  liveEvents = 0
  constructor(public name: string, public userId: number, public cookie: string, public pref: 'A' | 'B') {}
}

// ── setting up the invented shop ──

interface Setup {
  workshopId: number
  gradeId: number
  clientId: number
  clientOrgId: number | null
  moulds: { id: number; code: string; pullsAtStart: number }[]
  /** the register's last entry before the soak: the seed's own history stays out of the counts */
  eventsBefore: number
  casters: { id: number; email: string }[]
  finishers: { id: number; email: string }[]
}

async function setUpShop(k: Knex, o: SoakOptions): Promise<Setup> {
  const lead = await k('users').where({ email: DEMO_USERS[0].email }).first('workshop_id')
  const workshopId = Number(lead.workshop_id)
  const grade = await k('plaster_grades').where({ workshop_id: workshopId }).orderBy('id').first('id')
  const caster = await k('users').where({ role: 'caster', workshop_id: workshopId }).first('password_hash')
  const client = await k('users').where({ email: DEMO_USERS.find(u => u.key === 'client1')!.email }).first('id', 'client_org_id')
  // invented people of the soak's own, with the demo password (copied hash: no scrypt per person)
  const person = async (role: string, n: number) => {
    const email = `${role}-${n}@soak.example.test`
    const [row] = await k('users').insert({ workshop_id: workshopId, email, name: `Soak ${role} ${n}`, role, password_hash: caster.password_hash }).returning('id')
    return { id: Number(row.id), email }
  }
  const casters = []
  for (let i = 1; i <= o.casters; i++) casters.push(await person('caster', i))
  const finishers = []
  for (let i = 1; i <= o.finishers; i++) finishers.push(await person('finisher', i))
  const moulds = []
  for (let i = 1; i <= Math.max(10, o.casters + 4); i++) {
    const code = `SK-${String(i).padStart(2, '0')}`
    const [row] = await k('moulds').insert({
      workshop_id: workshopId, code, casts: 'Soak test panel, 300 mm', material: 'silicone', cavity_litres: 1.5,
      prep_minutes: 5, clean_minutes: 5, max_dwell_minutes: 240, pulls: 0, expected_pulls: 5000,
    }).returning('id')
    moulds.push({ id: Number(row.id), code, pullsAtStart: 0 })
  }
  const last = await k('events').max<{ max: string | null }[]>('id as max')
  return { eventsBefore: Number(last[0]?.max ?? 0), workshopId, gradeId: Number(grade.id), clientId: Number(client.id), clientOrgId: client.client_org_id, moulds, casters, finishers }
}

/** A day's orders arriving: small jobs of one or two items on the soak's moulds, the client on each. */
async function orderDay(k: Knex, s: Setup, r: Prng, day: number, pieces: number, dueOn: string) {
  const jobs: { id: number; code: string; pieces: number }[] = []
  let left = pieces
  for (let n = 1; left > 0 && n <= 100; n++) {
    const code = `SK-D${day + 1}-${String(n).padStart(2, '0')}`
    const [job] = await k('jobs').insert({ workshop_id: s.workshopId, code, title: `Soak order ${n} of day ${day + 1}`, client_org_id: s.clientOrgId, due_on: dueOn }).returning('id')
    const jobId = Number(job.id)
    await k('job_members').insert({ workshop_id: s.workshopId, job_id: jobId, user_id: s.clientId })
    let jobPieces = 0
    for (let i = 0; i < r.int(1, 2) && left > 0; i++) {
      const n2 = Math.min(left, r.int(1, 3))
      await k('job_items').insert({ workshop_id: s.workshopId, job_id: jobId, mould_id: r.pick(s.moulds).id, description: `Panel run ${i + 1}`, pieces_needed: n2, quantity: n2, grade_id: s.gradeId })
      left -= n2
      jobPieces += n2
    }
    jobs.push({ id: jobId, code, pieces: jobPieces })
  }
  return jobs
}

/**
 * A knex of its own for one stage, retried a few times: a pool kept across a database restart
 * would hand out dead connections, and a stage may start just as the database comes back.
 */
async function withDb<T>(url: string, work: (db: Knex) => Promise<T>): Promise<T> {
  for (let i = 0; ; i++) {
    const db = knex({ client: 'pg', connection: url, pool: { min: 0, max: 3 } })
    try {
      return await work(db)
    }
    catch (e) {
      if (i >= 10) throw e
      await sleep(500)
    }
    finally {
      await db.destroy()
    }
  }
}

const dayText = (offset: number) => new Date(Date.now() + offset * 86_400_000).toISOString().slice(0, 10)

// ── the run ──

export async function runSoak(o: SoakOptions): Promise<SoakReport> {
  const log = o.log ?? (() => undefined)
  const started = Date.now()
  const deadline = started + o.maxMinutes * 60_000
  const r = prng(o.seed)
  const base = mkdtempSync(join(tmpdir(), 'setline-soak-'))
  chmodSync(base, 0o755)
  let target: DbTarget | undefined
  let fake: SmtpFake | undefined
  const sockets: Socket[] = []
  const photoDir = mkdtempSync(join(tmpdir(), 'setline-soak-photos-'))
  let shop: Shop | undefined
  try {
    log(`soak: seed ${o.seed}, ${o.days} day(s), ${o.casters} caster tablets, ${o.finishers} finishers`)
    target = await ownSeededCluster(base, 'soak')
    const tgt = target
    fake = await startSmtpFake(0)
    const delivered: Delivered[] = []
    let seenMail = 0
    const mailWatch = setInterval(() => {
      // the fake keeps its latest 500: copy each new message out before it can roll off
      for (const m of fake!.messages) {
        if (m.id > seenMail) {
          delivered.push({ to: m.to.join(','), subject: m.subject, text: m.text.replace(/\r\n/g, '\n').trim(), messageId: m.messageId })
          seenMail = m.id
        }
      }
    }, 100)
    const s = await withDb(tgt.url, db => setUpShop(db, o))
    shop = new Shop({
      DATABASE_URL: tgt.url, NUXT_SESSION_PASSWORD: randomBytes(24).toString('hex'), PHOTO_STORAGE_DIR: photoDir,
      MAIL_FAKE: '0', SMTP_HOST: '127.0.0.1', SMTP_PORT: String(fake.port), MAIL_WORKER_INTERVAL_MS: '300', MAIL_RETRY_BASE_SECONDS: '1',
      // a killed instance's claims run out within the run, so its mail is sent before the end
      MAIL_CLAIM_SECONDS: '15',
      OVERDUE_CHECK_INTERVAL_MS: '5000',
    }, deadline)
    await shop.start('A')
    await shop.start('B')
    const sh = shop
    const lead = await signIn(sh, DEMO_USERS[0].email)
    const client = await signIn(sh, DEMO_USERS.find(u => u.key === 'client1')!.email)
    const tablets: CasterTablet[] = []
    for (const [i, c] of s.casters.entries()) tablets.push(new CasterTablet(`caster tablet ${i + 1}`, c.id, await signIn(sh, c.email), i % 2 ? 'B' : 'A'))
    const finisherCookies = await Promise.all(s.finishers.map(f => signIn(sh, f.email)))
    const finisherActions: TabletAction[] = []
    const leadActions: TabletAction[] = []
    const faults = Object.fromEntries(FAULT_KINDS.map(f => [f, 0])) as Record<FaultKind, number>
    const actionMs: number[] = []
    // the caster's photo of each cast off the mould: a small picture, sent until answered
    const picture = await sharp({ create: { width: 64, height: 48, channels: 3, background: { r: 200, g: 190, b: 170 } } }).jpeg().toBuffer()
    const photoStats = { uploaded: 0, retried: 0 }
    const photoRuns: Promise<void>[] = []
    const uploadPhoto = async (t: CasterTablet, pourId: number, jobId: number) => {
      for (let i = 0; i < 200 && Date.now() < deadline; i++) {
        if (!t.online) {
          await sleep(200)
          continue
        }
        const form = new FormData()
        form.append('files', new Blob([new Uint8Array(picture)], { type: 'image/jpeg' }), `pour-${pourId}.jpg`)
        form.append('caption', 'Off the mould')
        form.append('pourId', String(pourId))
        const inst = sh.urlFor(t.pref)
        let status = 0
        try {
          const res = await fetch(`${inst.url}/api/jobs/${jobId}/photos`, { method: 'POST', headers: { cookie: t.cookie }, body: form, signal: AbortSignal.timeout(15_000) })
          status = res.status
          const text = await res.text()
          sh.statuses[status] = (sh.statuses[status] ?? 0) + 1
          if (status !== 201 && status !== 503) sh.problems.push(`${t.name}: photo of pour ${pourId} answered ${status}: ${text.slice(0, 300)}`)
        }
        catch {
          sh.statuses['no answer'] = (sh.statuses['no answer'] ?? 0) + 1
        }
        if (status !== 0 && status < 500) {
          photoStats.uploaded += status === 201 ? 1 : 0
          return
        }
        photoStats.retried++
        await sleep(Math.min(1500, 100 * 2 ** Math.min(i, 4)))
      }
    }
    const actionsPerDay: number[] = []
    let currentDay = 0
    let settledToday = 0
    let floorSettledToday = 0
    const jobsAll: { id: number; code: string; pieces: number; dispatched: boolean }[] = []
    let memWarmKb = 0
    let memPeakKb = 0
    const memWatch = setInterval(() => {
      for (const inst of Object.values(sh.instances)) {
        try {
          if (inst.up && inst.proc?.pid) memPeakKb = Math.max(memPeakKb, procKb(inst.proc.pid, 'VmRSS'))
        }
        catch { /* ended */ }
      }
    }, 250)

    // ── a caster tablet: live socket, outbox, taps ──
    const connect = (t: CasterTablet) => {
      t.socket?.close()
      const inst = sh.urlFor(t.pref)
      const sock = io(inst.url, { path: '/socket.io/', transports: ['websocket'], extraHeaders: { cookie: t.cookie }, reconnection: false, forceNew: true })
      sockets.push(sock)
      t.socket = sock
      sock.on('live', (e: { type: string; id: number; version?: number; row?: { state?: string } }) => {
        t.liveEvents++
        const v = t.view.get(e.id)
        if (e.type === 'pour.updated' && v && e.version && e.version > v.version && e.row?.state) t.view.set(e.id, { ...v, state: e.row.state, version: e.version })
      })
      sock.on('disconnect', () => {
        if (t.online && Date.now() < deadline) setTimeout(() => t.online && t.socket === sock && connect(t), 300)
      })
      sock.on('connect_error', () => {
        if (t.online && Date.now() < deadline) setTimeout(() => t.online && t.socket === sock && connect(t), 500)
      })
    }
    /** After a reconnect the tablet reads its floor cards again, as the floor page refetches. */
    const refresh = async (t: CasterTablet) => {
      const res = await sh.call(t.pref, t.cookie, 'GET', '/api/floor/today')
      if (res.status !== 200) return
      for (const card of res.data?.cards ?? res.data ?? []) {
        const p = card?.pour
        const v = p && t.view.get(p.id)
        if (v && !t.queue.some(a => a.entityId === p.id) && p.version >= v.version) t.view.set(p.id, { ...v, state: p.state, version: p.version })
      }
    }
    const goOffline = (t: CasterTablet) => {
      t.online = false
      t.abort.abort()
      t.socket?.close()
    }
    const goOnline = async (t: CasterTablet) => {
      t.abort = new AbortController()
      t.online = true
      connect(t)
      await refresh(t)
    }

    /**
     * The caster's next tap: the next step of the first pour that has one once its queued steps
     * land. A pour leaves the list only when the database's answer says it is done, so a
     * refused step (a pour re-timed under the tablet) is taken again from where it stands.
     */
    const tap = (t: CasterTablet) => {
      t.work = t.work.filter(id => NEXT_STEP[t.view.get(id)!.state] || t.queue.some(a => a.entityId === id))
      for (const pourId of t.work) {
        const v = t.view.get(pourId)!
        const queued = t.queue.filter(a => a.entityId === pourId)
        const kind = NEXT_STEP[queued.length ? STEP_TO[queued.at(-1)!.kind]! : v.state]
        if (kind) return tapStep(t, pourId, v, queued.length, kind)
      }
      return false
    }
    const tapStep = (t: CasterTablet, pourId: number, v: PourView, queuedSteps: number, kind: string) => {
      const body: Record<string, unknown> = kind === 'start_mixing'
        ? { waterTempC: r.int(16, 22) }
        : kind === 'poured'
          ? { plasterKg: v.plasterKg, waterKg: v.waterKg, shopTempC: r.int(15, 22) }
          : r.chance(0.1) ? { result: 'defect', defect: 'air holes', notes: 'Soak: a few blow holes on the face' } : { result: 'sound' }
      t.queue.push({
        id: randomUUID(), who: t.name, userId: t.userId, entity: 'pour', entityId: pourId, kind, version: v.version + queuedSteps,
        body, tappedAt: Date.now(), offline: !t.online, attempts: 0, replayed: false, day: currentDay,
      })
      return true
    }

    // Every step carries its tap time. The real outbox sends it only with a step sent over a
    // minute late and leaves a prompt one to the server's clock (app/stores/outbox.ts); in
    // compressed time a pour's taps are milliseconds apart, so a prompt step's server time
    // could fall after the next step's tap and refuse that step as dated before it (seen with
    // seed 20261203). In the shop the steps are minutes apart and that cannot happen.
    const sendHead = async (t: CasterTablet) => {
      const a = t.queue[0]!
      const res = await sh.call(t.pref, t.cookie, 'POST', `/api/pours/${a.entityId}/actions`, {
        ...a.body, actionId: a.id, kind: a.kind, version: a.version, at: new Date(a.tappedAt).toISOString(),
      }, t.abort.signal)
      a.attempts++
      // no answer or a 5xx: the outbox keeps the step and sends it again (a 500 is still counted as a defect)
      if (res.status === 0 || res.status >= 500) {
        await sleep(Math.min(1500, 80 * 2 ** Math.min(a.attempts, 4)))
        return
      }
      a.status = res.status
      a.settledAt = Date.now()
      a.replayed ||= res.replayed
      t.queue.shift()
      t.done.push(a)
      settledToday++
      floorSettledToday++
      const v = t.view.get(a.entityId)!
      if (res.status === 200) {
        actionMs.push(res.ms)
        const p = res.data.card.pour
        t.view.set(a.entityId, { ...v, state: p.state, version: p.version })
        if (a.kind === 'demoulded') photoRuns.push(uploadPhoto(t, a.entityId, v.jobId))
      }
      else if (res.status === 409 && res.data?.data?.version) {
        // the refusal is kept (done, with its status) and the card shows where the pour stands
        t.view.set(a.entityId, { ...v, state: res.data.data.state, version: res.data.data.version })
      }
      else {
        sh.problems.push(`${t.name}: ${a.kind} on pour ${a.entityId} answered ${res.status}: ${JSON.stringify(res.data).slice(0, 300)}`)
      }
    }

    let dayOpen = false
    const runTablet = async (t: CasterTablet) => {
      for (let i = 0; i < 200_000 && Date.now() < deadline; i++) {
        if (t.queue.length && t.online) {
          await sendHead(t)
          continue
        }
        if (t.queue.length < 4 && t.work.length && tap(t)) {
          // taps come in quickly while offline, so a queue builds
          await sleep(t.online ? 0 : r.int(30, 120))
          continue
        }
        if (!dayOpen && !t.work.length && !t.queue.length) return
        await sleep(30)
      }
    }

    // ── finishers and the lead's dispatch ──
    const stepPiece = async (who: string, userId: number, cookie: string, pref: 'A' | 'B', entity: 'piece' | 'dispatch', path: string, kind: string, body: Record<string, unknown>, entityId: number, version?: number) => {
      const a: TabletAction = { id: randomUUID(), who, userId, entity, entityId, kind, version, body, tappedAt: Date.now(), offline: false, attempts: 0, replayed: false, day: currentDay }
      ;(entity === 'dispatch' ? leadActions : finisherActions).push(a)
      for (let i = 0; i < 400 && Date.now() < deadline; i++) {
        const res = await sh.call(pref, cookie, 'POST', path, { ...body, actionId: a.id, ...(version === undefined ? {} : { kind, version }) })
        a.attempts++
        if (res.status === 0 || res.status >= 500) {
          await sleep(Math.min(1500, 80 * 2 ** Math.min(i, 4)))
          continue
        }
        a.status = res.status
        a.settledAt = Date.now()
        a.replayed ||= res.replayed
        settledToday++
        if (res.status === 200 || res.status === 201) actionMs.push(res.ms)
        else if (res.status !== 409) sh.problems.push(`${who}: ${kind} on ${entity} ${entityId} answered ${res.status}: ${JSON.stringify(res.data).slice(0, 300)}`)
        return res
      }
      return undefined
    }

    let finishingOpen = true
    const runFinisher = async (i: number) => {
      const cookie = finisherCookies[i]!
      const pref = i % 2 ? 'A' : 'B'
      for (let n = 0; n < 100_000 && Date.now() < deadline; n++) {
        const q = await sh.call(pref, cookie, 'GET', '/api/finishing')
        if (q.status !== 200) {
          await sleep(200)
          continue
        }
        // each finisher has their own pieces (by id), so two never reach for the same one
        const mine = [...q.data.toFettle, ...q.data.repair, ...q.data.drying, ...q.data.ready].filter((p: { id: number }) => p.id % s.finishers.length === i)
        if (!mine.length) {
          if (!finishingOpen) return
          await sleep(400)
          continue
        }
        const who = `finisher tablet ${i + 1}`
        // one step on each of their pieces per read of the queue, as a finisher works down a rack
        for (const piece of mine.slice(0, 8)) {
          const act = (kind: string, body: Record<string, unknown> = {}) => stepPiece(who, s.finishers[i]!.id, cookie, pref, 'piece', `/api/pieces/${piece.id}/actions`, kind, body, piece.id, piece.version)
          if (piece.state === 'to_fettle') await act('fettled')
          else if (piece.state === 'repair') await act('repaired', { notes: 'Soak: filled and rubbed down' })
          // constant weight needs weighings a day apart, longer than a compressed soak day: the
          // finisher weighs once, and the lead passes weighed pieces (runDispatch)
          else if (piece.state === 'drying' && !piece.lastWeighing) await act('weighed', { weighedKg: Number((piece.dryMassKg * 1.002).toFixed(3)) })
          else if (piece.state === 'drying' && piece.constantWeight?.isDry) await act('ready')
          else if (piece.state === 'ready') await act('packed')
        }
      }
    }
    const runDispatch = async () => {
      for (let n = 0; n < 100_000 && Date.now() < deadline; n++) {
        const q = await sh.call('B', lead, 'GET', '/api/finishing')
        if (q.status === 200) {
          for (const piece of q.data.drying.filter((p: { lastWeighing: unknown; constantWeight: { isDry: boolean } }) => p.lastWeighing && !p.constantWeight.isDry)) {
            await stepPiece('lead', 0, lead, 'B', 'piece', `/api/pieces/${piece.id}/actions`, 'ready', { override: true }, piece.id, piece.version)
          }
          for (const job of jobsAll.filter(j => !j.dispatched)) {
            const packed = q.data.packed.filter((p: { job: { id: number } | null }) => p.job?.id === job.id)
            if (packed.length !== job.pieces) continue
            const res = await stepPiece('lead', 0, lead, 'B', 'dispatch', `/api/jobs/${job.id}/dispatches`, 'dispatch.create', { pieceIds: packed.map((p: { id: number }) => p.id).sort((a: number, b: number) => a - b) }, job.id)
            if (res?.status === 201) job.dispatched = true
          }
        }
        if (!finishingOpen && jobsAll.every(j => j.dispatched)) return
        await sleep(600)
      }
    }
    const runClient = async () => {
      for (let n = 0; n < 100_000 && Date.now() < deadline && finishingOpen; n++) {
        const job = jobsAll.length ? r.pick(jobsAll) : undefined
        if (job) await sh.call('A', client, 'GET', `/api/client/jobs/${job.id}/progress`)
        await sleep(500)
      }
    }

    // ── faults ──
    const restartA = async () => {
      for (let i = 0; i < 10 && Date.now() < deadline; i++) {
        try {
          await sh.start('A')
          return
        }
        catch (e) {
          log(`soak: instance A did not start yet (${(e as Error).message}); trying again`)
          await sleep(1000)
        }
      }
    }
    const pgCtl = (what: 'stop' | 'start') => new Promise<void>((res) => {
      const p = spawn(process.execPath, ['--import', 'tsx', join(root, 'tests/soak/pg-ctl.ts'), what, JSON.stringify(tgt)], { cwd: root, stdio: 'ignore' })
      p.once('exit', () => res())
    })
    const fault = async (kind: FaultKind, tablet?: CasterTablet) => {
      faults[kind]++
      if (kind === 'tablet drop' && tablet) {
        goOffline(tablet)
        await sleep(r.int(500, 4000))
        await goOnline(tablet)
      }
      else if (kind === 'app killed') {
        // mid-request: wait (bounded) for a request in flight on A, then kill it without warning
        for (let i = 0; i < 100 && sh.instances.A.inflight === 0; i++) await sleep(20)
        sh.instances.A.proc?.kill('SIGKILL')
        sh.instances.A.up = false
        log(`soak: day ${currentDay + 1}: instance A killed with ${sh.instances.A.inflight} request(s) in flight`)
        await sleep(r.int(500, 2000))
        await restartA()
      }
      else if (kind === 'database restarted') {
        log(`soak: day ${currentDay + 1}: PostgreSQL stopping`)
        sh.dbDown = true
        await pgCtl('stop')
        await sleep(r.int(1000, 3000))
        await pgCtl('start')
        sh.dbDown = false
        log(`soak: day ${currentDay + 1}: PostgreSQL back`)
      }
      else if (kind === 'mail refused') {
        fake!.refuseNext(s.workshopId, 1_000_000)
        await sleep(r.int(1000, 4000))
        fake!.refuseNext(s.workshopId, 0)
      }
    }

    // ── the week ──
    const finisherRuns = s.finishers.map((_, i) => runFinisher(i))
    const dispatchRun = runDispatch()
    const clientRun = runClient()
    for (let day = 0; day < o.days && Date.now() < deadline; day++) {
      currentDay = day
      settledToday = 0
      floorSettledToday = 0
      const date = dayText(day + 1)
      const jobs = await withDb(tgt.url, db => db.transaction(trx => orderDay(trx, s, r, day, o.piecesPerDay, dayText(day + 8))))
      // the lead's morning: the shop's temperature, a planner run, the casters on the pours, a few moves and voids
      await sh.steady('B', lead, 'PUT', `/api/shop-days/${date}`, { tempC: r.int(14, 22), humidityPct: r.int(45, 70) })
      const preview = await sh.steady('B', lead, 'POST', '/api/planner/preview', { from: date, to: date })
      const ours = new Set(jobs.map(j => j.id))
      const items = await withDb(tgt.url, db => db('job_items').whereIn('job_id', [...ours]).select('id', 'job_id', 'mould_id', 'pieces_needed'))
      const jobOfItem = new Map(items.map(it => [Number(it.id), Number(it.job_id)]))
      const proposal = (preview.data?.pours ?? []).filter((p: { jobId: number }) => ours.has(p.jobId))
      if (proposal.length) {
        const acc = await sh.steady('B', lead, 'POST', '/api/planner/accept', { from: date, to: date, pours: proposal.map((p: { jobItemId: number; mouldId: number; slotStart: string }) => ({ jobItemId: p.jobItemId, mouldId: p.mouldId, slotStart: p.slotStart })) })
        if (acc.status !== 201) log(`soak: day ${day + 1}: planner accept answered ${acc.status} ${JSON.stringify(acc.data).slice(0, 200)}`)
      }
      // what the planner left out goes on by hand, after the day's last pour on the mould
      const ourItems = new Set(items.map(it => Number(it.id)))
      // the board's wire rows by name (leanPour): t is [slotStart, slotEnd, mixAt, demouldOpenAt, demouldCloseAt] in ms
      const board = async () => (((await sh.steady('B', lead, 'GET', `/api/board?from=${date}&to=${date}`)).data?.pours ?? []) as BoardPourRow[]).map(leanPour)
        // only pours of job items are the soak's own
        .filter((p): p is BoardPourFields & { jobItemId: number } => p.jobItemId !== null)
      let pours = (await board()).filter(p => ourItems.has(p.jobItemId))
      const planOne = async (itemId: number, mouldId: number) => {
        const onMould = (await board()).filter(p => p.mouldId === mouldId)
        let start = onMould.reduce((t, p) => Math.max(t, p.t[1]!), Date.parse(`${date}T06:00:00Z`))
        for (let i = 0; i < 8; i++) {
          const res = await sh.steady('B', lead, 'POST', '/api/pours', { mouldId, jobItemId: itemId, slotStart: new Date(start).toISOString() })
          if (res.status === 201) return
          start += 30 * 60_000
        }
        sh.problems.push(`the lead could not plan item ${itemId} on mould ${mouldId} on ${date}`)
      }
      for (const it of items) {
        const short = Number(it.pieces_needed) - pours.filter(p => p.jobItemId === Number(it.id)).length
        for (let i = 0; i < short; i++) await planOne(Number(it.id), Number(it.mould_id))
      }
      pours = (await board()).filter(p => ourItems.has(p.jobItemId) && p.state === 'planned')
      // a few voids, each planned again so the order is still made
      for (const p of pours.filter(() => r.chance(0.08))) {
        const v = await sh.steady('B', lead, 'POST', `/api/pours/${p.id}/void`, { version: p.version, reason: 'Soak: mould needs a fresh release coat first' })
        if (v.status === 200) await planOne(p.jobItemId, p.mouldId)
      }
      pours = (await board()).filter(p => ourItems.has(p.jobItemId) && p.state === 'planned')
      // the casters on the pours (a lead move of each), handed to the tablets
      const byCaster = new Map<number, CasterTablet>(tablets.map(t => [t.userId, t]))
      for (const [i, p] of pours.entries()) {
        const t = tablets[i % tablets.length]!
        const moved = await sh.steady('B', lead, 'PATCH', `/api/pours/${p.id}`, { version: p.version, casterId: t.userId })
        const row = moved.status === 200 ? moved.data : p
        byCaster.get(t.userId)!.view.set(p.id, { state: row.state, version: row.version, plasterKg: row.plasterKg, waterKg: row.waterKg, jobId: jobOfItem.get(p.jobItemId)! })
        t.work.push(p.id)
      }
      const expected = pours.length * 3
      log(`soak: day ${day + 1} (${date}): ${jobs.length} jobs, ${pours.length} pours on the tablets`)
      jobsAll.push(...jobs.map(j => ({ ...j, dispatched: false })))
      // the faults of the day, each at a point of the day's work drawn from the seed
      const schedule: { at: number; kind: FaultKind; tablet?: CasterTablet }[] = [
        ...tablets.flatMap(t => Array.from({ length: r.int(1, 2) }, () => ({ at: r.int(5, 80) / 100, kind: 'tablet drop' as const, tablet: t }))),
        { at: r.int(15, 60) / 100, kind: 'app killed' as const },
        { at: r.int(20, 70) / 100, kind: 'database restarted' as const },
        { at: r.int(10, 70) / 100, kind: 'mail refused' as const },
      ].sort((a, b) => a.at - b.at)
      // mid-day the lead enters a warmer afternoon: the day's planned pours are re-timed under the tablets
      let retimed = false
      dayOpen = true
      const tabletRuns = tablets.map(t => runTablet(t))
      const running: Promise<void>[] = []
      for (let i = 0; i < 100_000 && Date.now() < deadline; i++) {
        const progress = floorSettledToday / Math.max(1, expected)
        while (schedule.length && schedule[0]!.at <= progress) {
          const f = schedule.shift()!
          running.push(fault(f.kind, f.tablet))
        }
        if (!retimed && progress > 0.3) {
          retimed = true
          running.push(sh.steady('B', lead, 'PUT', `/api/shop-days/${date}`, { tempC: r.int(23, 26), humidityPct: r.int(45, 70) }).then(() => undefined))
        }
        if (day === 0 && !memWarmKb && progress > 0.5 && sh.instances.B.proc?.pid) memWarmKb = procKb(sh.instances.B.proc.pid, 'VmRSS')
        if (tablets.every(t => !t.work.length && !t.queue.length)) break
        await sleep(50)
      }
      dayOpen = false
      // the faults still due fire now: a quick day must still meet every kind
      for (const f of schedule) running.push(fault(f.kind, f.tablet))
      await Promise.all(running)
      await Promise.all(tabletRuns)
      for (const t of tablets) {
        // leftover taps after a late fault or refusal
        await runTablet(t)
      }
      actionsPerDay.push(settledToday)
      log(`soak: day ${day + 1}: floor work done at ${((Date.now() - started) / 1000).toFixed(0)} s`)
    }
    // the finishers work the last pieces to dispatch, then the mail outbox drains
    for (let i = 0; i < 2400 && Date.now() < deadline; i++) {
      if (jobsAll.every(j => j.dispatched)) break
      await sleep(250)
    }
    // the last day's finishing tail counts with it
    if (actionsPerDay.length) actionsPerDay[actionsPerDay.length - 1] = settledToday
    finishingOpen = false
    log(`soak: ${jobsAll.filter(j => j.dispatched).length} of ${jobsAll.length} orders dispatched at ${((Date.now() - started) / 1000).toFixed(0)} s`)
    await Promise.all([...finisherRuns, dispatchRun, clientRun, ...photoRuns])
    for (let i = 0; i < 600 && Date.now() < deadline; i++) {
      const left = await withDb(tgt.url, db => db('mail_outbox').whereNot({ status: 'sent' }).count<{ count: string }[]>('id as count'))
      if (Number(left[0]!.count) === 0) break
      await sleep(250)
    }
    await sleep(500)
    clearInterval(mailWatch)
    // each tablet comes back once more and reads its cards: its view is then compared with the database
    for (const t of tablets) await refresh(t)
    const finished = Date.now() < deadline && jobsAll.every(j => j.dispatched)
    const photoCounts = await withDb(tgt.url, db => db('photos').whereIn('pour_id', tablets.flatMap(t => [...t.view.keys()])).groupBy('pour_id').select('pour_id').count<{ pour_id: string; count: string }[]>('id as count'))
    const memEndKb = sh.instances.B.proc?.pid ? procKb(sh.instances.B.proc.pid, 'VmRSS') : 0
    clearInterval(memWatch)

    // a run stopped at its deadline says what it was waiting for: the orders not sent, where
    // their pours and pieces stand, and each tablet's work still open with its last answers
    const left = finished ? [] : ['stopped at the deadline', ...await withDb(tgt.url, db => workLeft(db, jobsAll.filter(j => !j.dispatched), tablets))]
    const invariants = await withDb(tgt.url, db => checkInvariants(db, s, tablets, [...finisherActions, ...leadActions], delivered, sh, { warmKb: memWarmKb, endKb: memEndKb }, left))
    const demouldedOnTablets = tablets.flatMap(t => [...t.view].filter(([, v]) => v.state === 'demoulded').map(([id]) => id))
    const withPhoto = new Set(photoCounts.map(c => Number(c.pour_id)))
    const noPhoto = demouldedOnTablets.filter(id => !withPhoto.has(id))
    invariants.push({
      name: 'every cast off the mould has its photo', held: noPhoto.length === 0,
      detail: noPhoto.length ? `${noPhoto.length} without: pours ${noPhoto.slice(0, 5).join(', ')}` : `${demouldedOnTablets.length} pours, ${photoStats.uploaded} photos`,
    })
    const all = [...tablets.flatMap(t => [...t.done, ...t.queue]), ...finisherActions, ...leadActions]
    const settled = all.filter(a => a.settledAt)
    return {
      seed: o.seed, days: o.days, seconds: (Date.now() - started) / 1000, actionsPerDay, faults,
      queuedOffline: all.filter(a => a.offline).length,
      replayed: all.filter(a => a.replayed).length,
      retried: all.filter(a => a.attempts > 1).length,
      refusals: settled.filter(a => a.status === 409 || a.status === 422).length,
      longestWaitMs: settled.reduce((m, a) => Math.max(m, a.settledAt! - a.tappedAt), 0),
      p95ActionMs: percentile(actionMs, 95),
      photos: { ...photoStats, poursWithMore: photoCounts.filter(c => Number(c.count) > 1).length },
      mailsSent: delivered.length,
      statuses: sh.statuses,
      memory: { warmKb: memWarmKb, endKb: memEndKb, peakKb: memPeakKb },
      invariants, finished,
    }
  }
  finally {
    // the servers' own logs, for a run that found something
    mkdirSync(join(root, 'test-output'), { recursive: true })
    for (const inst of Object.values(shop?.instances ?? {})) writeFileSync(join(root, `test-output/soak-server-${inst.name}.log`), inst.output.join(''))
    for (const sock of sockets) sock.close()
    for (const inst of Object.values(shop?.instances ?? {})) inst.proc?.kill('SIGKILL')
    await fake?.close()
    if (target) downCluster(target)
    rmSync(base, { recursive: true, force: true })
    rmSync(photoDir, { recursive: true, force: true })
  }
}

/** What a run stopped at its deadline was still waiting for, a line per order and per tablet. */
async function workLeft(k: Knex, jobs: { id: number; code: string; pieces: number }[], tablets: CasterTablet[]): Promise<string[]> {
  const out: string[] = []
  for (const j of jobs) {
    const pours = await k('pours as p').join('job_items as i', 'i.id', 'p.job_item_id').where('i.job_id', j.id)
      .select('p.id', 'p.state', 'p.version', 'p.caster_id').orderBy('p.id')
    const pieces = await k('pieces as pc').join('job_items as i', 'i.id', 'pc.job_item_id').where('i.job_id', j.id).select('pc.id', 'pc.state', 'pc.version').orderBy('pc.id')
    out.push(`order ${j.code} (${j.pieces} pieces): pours ${pours.map(p => `${p.id} ${p.state} v${p.version} caster ${p.caster_id ?? '-'}`).join(', ') || 'none'}; `
      + `pieces ${pieces.map(p => `${p.id} ${p.state} v${p.version}`).join(', ') || 'none'}`)
  }
  for (const t of tablets) {
    if (!t.work.length && !t.queue.length) continue
    const last = t.done.slice(-3).map(a => `${a.kind} ${a.entityId} v${a.version} → ${a.status}`).join(', ')
    out.push(`${t.name}${t.online ? '' : ' (offline)'}: work ${t.work.map(id => `${id} ${t.view.get(id)?.state} v${t.view.get(id)?.version}`).join(', ')}; `
      + `queued ${t.queue.map(a => `${a.kind} ${a.entityId} v${a.version} (${a.attempts} tries)`).join(', ') || 'nothing'}; last answers ${last || 'none'}`)
  }
  return out
}

// ── the invariants, from the database and the tablets' records ──

async function checkInvariants(
  k: Knex, s: Setup, tablets: CasterTablet[], others: TabletAction[], delivered: Delivered[],
  shop: Shop, mem: { warmKb: number; endKb: number }, left: string[],
): Promise<Invariant[]> {
  const out: Invariant[] = []
  const inv = (name: string, bad: string[], ok: string) => out.push({ name, held: bad.length === 0, detail: bad.length ? `${bad.length}: ${bad.slice(0, 8).join('; ')}` : ok })
  const floor = tablets.flatMap(t => [...t.done, ...t.queue])
  const all = [...floor, ...others]

  // 1. every action landed exactly once: settled, stored once under its id with the answer the tablet got
  const stored = new Map((await k('processed_actions').whereIn('id', all.map(a => a.id)).select('id', 'kind', 'entity_id', 'status', 'user_id'))
    .map(p => [p.id as string, p]))
  const bad1: string[] = []
  for (const a of all) {
    const p = stored.get(a.id)
    if (!a.settledAt) bad1.push(`${a.who} ${a.kind} ${a.entity} ${a.entityId} never answered`)
    else if (!p) bad1.push(`${a.who} ${a.kind} ${a.entity} ${a.entityId} answered ${a.status} but not stored`)
    else if (p.status !== (a.status === 201 ? 200 : a.status)) bad1.push(`${a.id}: stored ${p.status}, tablet saw ${a.status}`)
  }
  // …and made exactly one register entry per landed step: no step doubled, none lost
  const ok = floor.filter(a => a.status === 200)
  const pourIds = [...new Set(floor.map(a => a.entityId))]
  const events = await k('events').where({ workshop_id: s.workshopId, entity: 'pour' }).where('id', '>', s.eventsBefore).whereIn('entity_id', pourIds.map(String))
    .whereIn('type', Object.values(STEP_EVENT)).orderBy('id').select('id', 'entity_id', 'type', 'actor_id', 'at')
  const count = (xs: { key: string }[]) => xs.reduce((m, x) => m.set(x.key, (m.get(x.key) ?? 0) + 1), new Map<string, number>())
  const want = count(ok.map(a => ({ key: `${a.entityId}:${STEP_EVENT[a.kind]}` })))
  const got = count(events.map(e => ({ key: `${e.entity_id}:${e.type}` })))
  for (const key of new Set([...want.keys(), ...got.keys()])) if (want.get(key) !== got.get(key)) bad1.push(`pour step ${key}: ${want.get(key) ?? 0} taken, ${got.get(key) ?? 0} registered`)
  const pieceOk = others.filter(a => a.entity === 'piece' && a.status === 200)
  const pieceEvents = await k('events').where({ workshop_id: s.workshopId, entity: 'piece' }).where('id', '>', s.eventsBefore).whereIn('entity_id', [...new Set(pieceOk.map(a => String(a.entityId)))])
    .whereNot({ type: 'piece.created' }).whereNot({ type: 'piece.dispatched' }).select('entity_id', 'type')
  const wantP = count(pieceOk.map(a => ({ key: `${a.entityId}:piece.${a.kind}` })))
  const gotP = count(pieceEvents.map(e => ({ key: `${e.entity_id}:${e.type}` })))
  for (const key of new Set([...wantP.keys(), ...gotP.keys()])) if (wantP.get(key) !== gotP.get(key)) bad1.push(`piece step ${key}: ${wantP.get(key) ?? 0} taken, ${gotP.get(key) ?? 0} registered`)
  const notes = await k('dispatches').where({ workshop_id: s.workshopId }).whereIn('job_id', others.filter(a => a.entity === 'dispatch').map(a => a.entityId)).select('job_id')
  const wantD = others.filter(a => a.entity === 'dispatch' && a.status === 201).length
  if (notes.length !== wantD) bad1.push(`${wantD} dispatch notes made by the lead, ${notes.length} in the database`)
  inv('every action landed exactly once', bad1, `${all.length} actions (${ok.length} floor steps, ${pieceOk.length} finishing steps, ${wantD} dispatch notes), each stored once, one register entry per step`)

  // 2. every demoulded pour: one piece, one pull on its mould
  const demoulded = await k('pours').where({ workshop_id: s.workshopId, state: 'demoulded' }).whereIn('mould_id', s.moulds.map(m => m.id)).select('id', 'mould_id')
  const pieces = count((await k('pieces').whereIn('pour_id', demoulded.map(p => p.id)).select('pour_id')).map(p => ({ key: String(p.pour_id) })))
  const bad2 = demoulded.filter(p => pieces.get(String(p.id)) !== 1).map(p => `pour ${p.id}: ${pieces.get(String(p.id)) ?? 0} pieces`)
  const pulls = new Map((await k('moulds').whereIn('id', s.moulds.map(m => m.id)).select('id', 'pulls', 'code')).map(m => [Number(m.id), m]))
  for (const m of s.moulds) {
    const n = demoulded.filter(p => Number(p.mould_id) === m.id).length
    const now = Number(pulls.get(m.id)!.pulls)
    if (now - m.pullsAtStart !== n) bad2.push(`mould ${m.code}: ${n} demoulds, ${now - m.pullsAtStart} pulls`)
  }
  inv('every demoulded pour has one piece and one pull', bad2, `${demoulded.length} demoulded pours on ${s.moulds.length} moulds`)

  // 3. no two live pours overlap on a mould
  const overlaps = await k.raw(`SELECT a.id AS a, b.id AS b FROM pours a JOIN pours b ON a.mould_id = b.mould_id AND a.id < b.id AND a.slot && b.slot
    WHERE a.state <> 'void' AND b.state <> 'void' AND a.workshop_id = ?`, [s.workshopId])
  inv('no two live pours overlap on a mould', overlaps.rows.map((x: { a: number; b: number }) => `pours ${x.a} and ${x.b}`), 'none overlap')

  // 4. the register holds every step in order, by the person who took it
  const bad4: string[] = []
  const takenBy = new Map(ok.map(a => [`${a.entityId}:${STEP_EVENT[a.kind]}`, a.userId]))
  const byPour = new Map<string, typeof events>()
  for (const e of events) byPour.set(e.entity_id, [...(byPour.get(e.entity_id) ?? []), e])
  for (const [pour, es] of byPour) {
    const types = es.map(e => e.type).join(',')
    if (!['pour.mixing', 'pour.mixing,pour.poured', 'pour.mixing,pour.poured,pour.demoulded'].includes(types)) bad4.push(`pour ${pour}: ${types}`)
    for (let i = 1; i < es.length; i++) if (es[i]!.at < es[i - 1]!.at) bad4.push(`pour ${pour}: ${es[i]!.type} dated before ${es[i - 1]!.type}`)
    for (const e of es) if (Number(e.actor_id) !== takenBy.get(`${pour}:${e.type}`)) bad4.push(`pour ${pour}: ${e.type} by user ${e.actor_id}`)
  }
  inv('the register holds every step in order with the right person', bad4, `${events.length} floor entries on ${byPour.size} pours`)

  // 5. each mail went out once per its key. Sending is at least once (claim, commit, send, mark:
  // an instance killed between the relay's acceptance and the mark sends that mail again once its
  // claim runs out), so a mail is one message per Message-ID: every copy of a resend carries the
  // outbox row's own Message-ID and a mail store shows them as one (RFC 5322 §3.6.4).
  const rows = await k('mail_outbox').select('to_email', 'subject', 'text', 'status', 'dedupe_key', 'message_token')
  const bad5 = rows.filter(m => m.status !== 'sent').map(m => `${m.dedupe_key ?? m.subject}: ${m.status}`)
  const tokenOf = (messageId: string | null) => messageId?.match(/^<([^@>]+)@/)?.[1] ?? '(none)'
  const byToken = new Map(rows.map(m => [String(m.message_token), m]))
  const copies = count(delivered.map(m => ({ key: tokenOf(m.messageId) })))
  for (const m of rows) if (m.status === 'sent' && !copies.has(String(m.message_token))) bad5.push(`${m.to_email} ${m.subject}: in the outbox as sent, never delivered`)
  for (const m of delivered) {
    const row = byToken.get(tokenOf(m.messageId))
    if (!row) bad5.push(`${m.to} ${m.subject}: delivered with Message-ID ${m.messageId ?? 'none'}, no such mail in the outbox`)
    else if (row.to_email !== m.to || row.subject !== m.subject || String(row.text).replace(/\r\n/g, '\n').trim() !== m.text) bad5.push(`${m.messageId}: delivered text differs from the outbox`)
  }
  const resent = [...copies.values()].filter(n => n > 1).length
  const keys = count(rows.filter(m => m.dedupe_key).map(m => ({ key: m.dedupe_key as string })))
  for (const [key, n] of keys) if (n > 1) bad5.push(`${key} queued ${n} times`)
  inv('each mail went out once per its key', bad5, `${rows.length} mails, ${copies.size} Message-IDs delivered${resent ? `, ${resent} sent again after a kill with the same Message-ID` : ''}`)

  // 6. each tablet's view after reconnecting equals the database
  const bad6: string[] = []
  const dbPours = new Map((await k('pours').whereIn('id', tablets.flatMap(t => [...t.view.keys()])).select('id', 'state', 'version')).map(p => [Number(p.id), p]))
  for (const t of tablets) {
    for (const [id, v] of t.view) {
      const p = dbPours.get(id)
      if (!p || p.state !== v.state || Number(p.version) !== v.version) bad6.push(`${t.name} pour ${id}: shows ${v.state} v${v.version}, database ${p?.state} v${p?.version}`)
    }
  }
  inv('each tablet\'s view after reconnecting equals the database', bad6, `${tablets.reduce((n, t) => n + t.view.size, 0)} cards on ${tablets.length} tablets`)

  // 7. no 500, and no instance threw what it did not catch (it would have ended without being killed)
  const crashes = Object.values(shop.instances).flatMap(inst => inst.output.join('').split('\n')
    .filter(l => /uncaught|unhandled/i.test(l)).map(l => `instance ${inst.name}: ${l.slice(0, 200)}`))
  inv('no response was a 500 (503 only while the database was away)', [...shop.problems, ...crashes], `${Object.values(shop.statuses).reduce((a, b) => a + b, 0)} responses`)

  // 8. memory after the run within 20 % of after warm-up (instance B, never killed)
  const growth = mem.warmKb ? (mem.endKb - mem.warmKb) / mem.warmKb : NaN
  inv('server memory after the run within 20 % of after warm-up', Number.isFinite(growth) && growth <= 0.2 ? [] : [`${(mem.warmKb / 1024).toFixed(0)} MB → ${(mem.endKb / 1024).toFixed(0)} MB`],
    `${(mem.warmKb / 1024).toFixed(0)} MB → ${(mem.endKb / 1024).toFixed(0)} MB (${(growth * 100).toFixed(0)} %)`)

  inv('the run finished its week within its time bound', left, 'every order dispatched')
  return out
}
