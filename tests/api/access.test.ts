// Role guard for every route that exists, and workshop tenancy. The route table below must
// name every file under server/api: a new route without a row here fails the first test.
import { readdirSync, statSync } from 'node:fs'
import { join, relative } from 'node:path'
import { randomUUID } from 'node:crypto'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { call, signIn } from '../setup/http'
import { GRADE_PRESETS, plasterGradeFromPreset } from '../../shared/utils/plaster'
import { DEMO_PASSWORD, closeTestDb, demo, demoWorkshopId, makeOtherWorkshop, makeUser, testDb } from '../setup/fixtures'
import { boardFixture } from '../setup/board-fixtures'
import { finishingFixture } from '../setup/finishing-fixtures'
import { jpegWithGps, photoForm } from '../setup/photo-fixtures'

const GRADE_PRESET_MIX = { grade: GRADE_PRESETS['beta-casting'], cavityLitres: 1, maxDwellMinutes: 60, consistency: 70, wastePct: 0, waterTempC: 20, powderTempC: 20, shopTempC: 20, setFactor: 1 }

type Role = 'lead' | 'caster' | 'finisher' | 'client'
interface RouteRow {
  method: string
  path: string
  roles: Role[] | 'public'
  body?: () => Promise<unknown> | unknown
  target?: () => Promise<string>
  /** a multipart body instead of JSON */
  form?: () => Promise<FormData>
  /** a fresh target for every call (a delete that the first allowed call uses up) */
  freshTarget?: boolean
}

let patchTarget = 0
let fx: Awaited<ReturnType<typeof boardFixture>> | undefined
const board = async () => (fx ??= await boardFixture('access'))
/** A fresh mould each call, so the lead's request (the only one allowed) always succeeds. */
const freshMould = async () => (await board()).mould()
/** A fresh planned pour (version 1) on its own mould, for the routes that change one. */
async function freshPour() {
  const r = await call('/api/pours', { method: 'POST', cookie: cookies.lead, body: { mouldId: await freshMould(), slotStart: '2027-09-01T09:00:00Z' } })
  return r.data.id as number
}
/** A fresh pour and one action id for it: every allowed role sends the same action (a replay answers 200). */
const floorAction = { path: '', actionId: '' }
async function freshFloorAction() {
  floorAction.path = `/api/pours/${await freshPour()}/actions`
  floorAction.actionId = randomUUID()
  return floorAction.path
}
/** A fresh piece to fettle and one action id for it (every allowed role sends the same action: a replay answers 200). */
let finishing: Awaited<ReturnType<typeof finishingFixture>> | undefined
const pieceAction = { path: '', actionId: '' }
async function freshPieceAction() {
  finishing ??= await finishingFixture('access-finish')
  pieceAction.path = `/api/pieces/${(await finishing.piece()).id}/actions`
  pieceAction.actionId = randomUUID()
  return pieceAction.path
}
/** A job with one packed piece (set straight in the database: the finishing tests drive the steps). */
const dispatchAction = { actionId: '', pieceId: 0 }
async function freshDispatch() {
  finishing ??= await finishingFixture('access-finish')
  const job = await finishing.job()
  const piece = await finishing.piece({ itemId: await finishing.item(job, null) })
  await testDb()('pieces').where({ id: piece.id }).update({ state: 'packed' })
  dispatchAction.actionId = randomUUID()
  dispatchAction.pieceId = piece.id
  return `/api/jobs/${job}/dispatches`
}
const STAFF: Role[] = ['lead', 'caster', 'finisher']
/** Rows the catalogue and job routes act on, made in beforeAll. */
const t = { photo: '', dispatch: 0, tablet: 0, grade: 0, lot: 0, bench: 0, mould: 0, job: 0, item: 0, delItem: 0, sampleJob: 0, decisionJob: 0, clientJob: 0, memberEmail: '', memberId: 0 }
const rnd = () => Math.random().toString(36).slice(2, 8).toUpperCase()
const ver = async (table: string, id: number) => Number((await testDb()(table).where({ id }).first('version')).version)
const gradeBody = () => ({ name: `Guard grade ${rnd()}`, bagKg: 25, grade: (({ label: _l, ...g }) => g)(plasterGradeFromPreset('beta-fibrous')) })
const mouldBody = () => ({ code: `G-${rnd()}`, casts: 'Guard', material: 'silicone', cavityLitres: 1, prepMinutes: 5, cleanMinutes: 5, maxDwellMinutes: 60, pulls: 0 })

const ROUTES: RouteRow[] = [
  { method: 'GET', path: '/api/health', roles: 'public' },
  { method: 'POST', path: '/api/auth/login', roles: 'public' },
  { method: 'POST', path: '/api/auth/logout', roles: 'public' },
  { method: 'GET', path: '/api/auth/invitation', roles: 'public' },
  { method: 'POST', path: '/api/auth/invitation', roles: 'public' },
  { method: 'POST', path: '/api/auth/password-reset', roles: 'public' },
  { method: 'POST', path: '/api/auth/password-reset/confirm', roles: 'public' },
  { method: 'GET', path: '/api/auth/me', roles: ['lead', 'caster', 'finisher', 'client'] },
  { method: 'GET', path: '/api/users', roles: ['lead'] },
  { method: 'PATCH', path: '/api/users/[id]', roles: ['lead'], body: () => ({ disabled: false }), target: async () => `/api/users/${patchTarget}` },
  { method: 'GET', path: '/api/invitations', roles: ['lead'] },
  { method: 'POST', path: '/api/invitations', roles: ['lead'], body: () => ({ email: `guard-${Math.random().toString(36).slice(2)}@fixture.example.test`, role: 'caster' }) },
  { method: 'GET', path: '/api/dev/mails', roles: ['lead'] },
  { method: 'POST', path: '/api/dev/mails/refuse', roles: ['lead'], body: () => ({ count: 0 }) },
  { method: 'GET', path: '/api/me/notifications', roles: ['lead', 'caster', 'finisher', 'client'] },
  { method: 'PATCH', path: '/api/me/notifications', roles: ['lead', 'caster', 'finisher', 'client'], body: () => ({ job_ready: true }) },
  { method: 'GET', path: '/api/me/pin', roles: ['caster', 'finisher'] },
  { method: 'PUT', path: '/api/me/pin', roles: ['caster', 'finisher'], body: () => ({ pin: '2719', password: DEMO_PASSWORD }) },
  { method: 'DELETE', path: '/api/me/pin', roles: ['caster', 'finisher'] },
  { method: 'DELETE', path: '/api/users/[id]/pin', roles: ['lead'], target: async () => `/api/users/${patchTarget}/pin` },
  { method: 'GET', path: '/api/tablets', roles: ['lead'] },
  { method: 'POST', path: '/api/tablets', roles: ['lead'], body: () => ({ name: `Guard tablet ${rnd()}` }) },
  { method: 'POST', path: '/api/tablets/[id]/revoke', roles: ['lead'], target: async () => `/api/tablets/${t.tablet}/revoke` },
  // the shared tablet's own routes answer to its device cookie, not a session (tests/api/tablet.test.ts)
  { method: 'GET', path: '/api/tablet/people', roles: 'public' },
  { method: 'POST', path: '/api/tablet/switch', roles: 'public' },
  { method: 'GET', path: '/api/quality', roles: ['lead'], target: async () => '/api/quality?from=2027-01-01&to=2027-01-31' },
  { method: 'GET', path: '/api/overview', roles: ['lead'] },
  { method: 'GET', path: '/api/client/jobs', roles: ['client'] },
  { method: 'GET', path: '/api/workshop', roles: ['lead'] },
  { method: 'PATCH', path: '/api/workshop', roles: ['lead'], body: async () => (await call('/api/workshop', { cookie: cookies.lead })).data },
  { method: 'GET', path: '/api/calc/options', roles: ['lead', 'caster', 'finisher'] },
  { method: 'POST', path: '/api/calc/mix', roles: ['lead', 'caster', 'finisher', 'client'], body: () => ({ ...GRADE_PRESET_MIX }) },
  { method: 'GET', path: '/api/board', roles: ['lead', 'caster', 'finisher'], target: async () => '/api/board?from=2027-09-01&to=2027-09-02' },
  { method: 'POST', path: '/api/pours', roles: ['lead'], body: async () => ({ mouldId: await freshMould(), slotStart: '2027-09-01T09:00:00Z' }) },
  { method: 'PATCH', path: '/api/pours/[id]', roles: ['lead'], body: () => ({ version: 1, slotStart: '2027-09-01T11:00:00Z' }), target: async () => `/api/pours/${await freshPour()}` },
  { method: 'POST', path: '/api/pours/[id]/actions', roles: ['lead', 'caster'], body: () => ({ actionId: floorAction.actionId, kind: 'start_mixing', version: 1, waterTempC: 18 }), target: freshFloorAction },
  { method: 'GET', path: '/api/floor/today', roles: ['lead', 'caster'] },
  { method: 'POST', path: '/api/pieces/[id]/actions', roles: ['lead', 'finisher'], body: () => ({ actionId: pieceAction.actionId, kind: 'fettled', version: 1 }), target: freshPieceAction },
  { method: 'GET', path: '/api/finishing', roles: ['lead', 'finisher'] },
  { method: 'POST', path: '/api/jobs/[id]/dispatches', roles: ['lead'], body: () => ({ actionId: dispatchAction.actionId, pieceIds: [dispatchAction.pieceId] }), target: freshDispatch },
  { method: 'GET', path: '/api/jobs/[id]/dispatches', roles: ['lead', 'finisher'], target: async () => `/api/jobs/${t.job}/dispatches` },
  { method: 'GET', path: '/api/dispatches/[id]', roles: ['lead', 'finisher'], target: async () => `/api/dispatches/${t.dispatch}` },
  { method: 'POST', path: '/api/pours/[id]/void', roles: ['lead'], body: () => ({ version: 1, reason: 'access test' }), target: async () => `/api/pours/${await freshPour()}/void` },
  { method: 'GET', path: '/api/shop-days', roles: ['lead', 'caster', 'finisher'], target: async () => '/api/shop-days?from=2027-09-01&to=2027-09-02' },
  { method: 'PUT', path: '/api/shop-days/[day]', roles: ['lead'], body: () => ({ tempC: 18, humidityPct: 50 }), target: async () => '/api/shop-days/2027-09-03' },
  { method: 'POST', path: '/api/planner/preview', roles: ['lead'], body: () => ({ from: '2027-09-06', to: '2027-09-07' }) },
  { method: 'POST', path: '/api/planner/accept', roles: ['lead'], body: async () => ({ from: '2027-09-01', to: '2027-09-01', pours: [{ jobItemId: await (await board()).item(await (await board()).job(), null), mouldId: await freshMould(), slotStart: '2027-09-01T13:00:00Z' }] }) },
  { method: 'GET', path: '/api/day-sheet', roles: ['lead', 'caster'], target: async () => '/api/day-sheet?day=2027-09-01' },
  { method: 'GET', path: '/api/day-sheet/export', roles: ['lead', 'caster'], target: async () => '/api/day-sheet/export?day=2027-09-01' },
  { method: 'GET', path: '/api/grades', roles: STAFF },
  { method: 'POST', path: '/api/grades', roles: ['lead'], body: gradeBody },
  { method: 'PATCH', path: '/api/grades/[id]', roles: ['lead'], body: async () => ({ notes: 'guard', version: await ver('plaster_grades', t.grade) }), target: async () => `/api/grades/${t.grade}` },
  { method: 'GET', path: '/api/lots', roles: STAFF },
  { method: 'POST', path: '/api/lots', roles: ['lead'], body: () => ({ gradeId: t.grade, lotCode: `G-${rnd()}`, bagsReceived: 2, bagKg: 25, receivedOn: '2026-12-01' }) },
  { method: 'PATCH', path: '/api/lots/[id]', roles: ['lead'], body: async () => ({ notes: 'guard', version: await ver('plaster_lots', t.lot) }), target: async () => `/api/lots/${t.lot}` },
  { method: 'GET', path: '/api/lots/export', roles: ['lead'] },
  { method: 'GET', path: '/api/benches', roles: STAFF },
  { method: 'POST', path: '/api/benches', roles: ['lead'], body: () => ({ name: `Guard ${rnd()}`, kind: 'casting', sortOrder: 5 }) },
  { method: 'PATCH', path: '/api/benches/[id]', roles: ['lead'], body: async () => ({ kind: 'flat casting', version: await ver('benches', t.bench) }), target: async () => `/api/benches/${t.bench}` },
  { method: 'GET', path: '/api/moulds', roles: STAFF },
  { method: 'POST', path: '/api/moulds', roles: ['lead'], body: mouldBody },
  { method: 'GET', path: '/api/moulds/[id]', roles: STAFF, target: async () => `/api/moulds/${t.mould}` },
  { method: 'PATCH', path: '/api/moulds/[id]', roles: ['lead'], body: async () => ({ casts: 'Guard edit', version: await ver('moulds', t.mould) }), target: async () => `/api/moulds/${t.mould}` },
  { method: 'POST', path: '/api/moulds/[id]/state', roles: ['lead'], body: async () => ({ state: 'cleaning', version: await ver('moulds', t.mould) }), target: async () => `/api/moulds/${t.mould}/state` },
  { method: 'GET', path: '/api/moulds/export', roles: ['lead'] },
  { method: 'GET', path: '/api/jobs', roles: STAFF },
  { method: 'POST', path: '/api/jobs', roles: ['lead'], body: () => ({ code: `G-${rnd()}`, title: 'Guard job' }) },
  { method: 'GET', path: '/api/jobs/[id]', roles: ['lead', 'caster', 'finisher', 'client'], target: async () => `/api/jobs/${t.clientJob}` },
  { method: 'PATCH', path: '/api/jobs/[id]', roles: ['lead'], body: async () => ({ site: 'Guard site', version: await ver('jobs', t.job) }), target: async () => `/api/jobs/${t.job}` },
  { method: 'POST', path: '/api/jobs/[id]/items', roles: ['lead'], body: () => ({ kind: 'pieces', profile: 'Guard', description: 'Guard item', quantity: 2 }), target: async () => `/api/jobs/${t.job}/items` },
  { method: 'PATCH', path: '/api/jobs/[id]/items/[itemId]', roles: ['lead'], body: async () => ({ kind: 'pieces', profile: 'Guard', description: 'Guard item', quantity: 3, version: await ver('job_items', t.item) }), target: async () => `/api/jobs/${t.job}/items/${t.item}` },
  { method: 'DELETE', path: '/api/jobs/[id]/items/[itemId]', roles: ['lead'], target: async () => `/api/jobs/${t.job}/items/${t.delItem}` },
  { method: 'POST', path: '/api/jobs/[id]/members', roles: ['lead'], body: () => ({ email: t.memberEmail }), target: async () => `/api/jobs/${t.job}/members` },
  { method: 'DELETE', path: '/api/jobs/[id]/members/[userId]', roles: ['lead'], target: async () => `/api/jobs/${t.job}/members/${t.memberId}` },
  { method: 'POST', path: '/api/jobs/[id]/sample', roles: ['lead'], body: async () => ({ state: 'awaiting_approval', version: await ver('jobs', t.sampleJob) }), target: async () => `/api/jobs/${t.sampleJob}/sample` },
  { method: 'POST', path: '/api/jobs/[id]/sample-decision', roles: ['client'], body: () => ({ decision: 'approved' }), target: async () => `/api/jobs/${t.decisionJob}/sample-decision` },
  { method: 'GET', path: '/api/jobs/[id]/export', roles: ['lead'], target: async () => `/api/jobs/${t.job}/export` },
  { method: 'GET', path: '/api/jobs/[id]/photos', roles: ['lead', 'caster', 'finisher', 'client'], target: async () => `/api/jobs/${t.clientJob}/photos` },
  { method: 'POST', path: '/api/jobs/[id]/photos', roles: STAFF, form: async () => photoForm([{ name: 'guard.jpg', data: await jpegWithGps(64, 48) }]), target: async () => `/api/jobs/${t.job}/photos` },
  { method: 'PATCH', path: '/api/photos/[id]', roles: STAFF, body: () => ({ caption: 'Guard caption' }), target: async () => `/api/photos/${t.photo}` },
  // the uploader or a lead: the photo is the lead's, so other staff are refused
  { method: 'DELETE', path: '/api/photos/[id]', roles: ['lead'], freshTarget: true, target: async () => `/api/photos/${await leadPhoto(t.job, false)}` },
  { method: 'GET', path: '/api/photos/[id]/[variant]', roles: ['lead', 'caster', 'finisher', 'client'], target: async () => `/api/photos/${t.photo}/thumb` },
  { method: 'GET', path: '/api/client/jobs/[id]/progress', roles: ['client'], target: async () => `/api/client/jobs/${t.clientJob}/progress` },
  { method: 'GET', path: '/api/jobs/[id]/register', roles: ['lead'], target: async () => `/api/jobs/${t.job}/register` },
  { method: 'GET', path: '/api/jobs/[id]/register/export', roles: ['lead'], target: async () => `/api/jobs/${t.job}/register/export` },
]

/** A photo the demo lead uploads to a job. */
async function leadPhoto(jobId: number, shared: boolean) {
  const r = await call(`/api/jobs/${jobId}/photos`, { method: 'POST', cookie: cookies.lead, form: photoForm([{ name: 'guard.jpg', data: await jpegWithGps(64, 48) }], { shared: String(shared) }) })
  if (r.status !== 201) throw new Error(`photo upload failed: ${r.status} ${JSON.stringify(r.data)}`)
  return r.data[0].id as string
}

/** The rows the guarded routes act on, in the demo workshop. */
async function makeTargets() {
  const k = testDb()
  const ws = await demoWorkshopId()
  const id = async (table: string, row: Record<string, unknown>) => Number((await k(table).insert({ workshop_id: ws, ...row }).returning('id'))[0].id)
  const g = gradeBody().grade
  t.grade = await id('plaster_grades', { name: `Guard ${rnd()}`, form: g.form, powder_density: g.powderDensity, consistency_min: 60, consistency_max: 80, consistency_default: 70, demould_minutes_ref: 40, set_time_water_exponent: 1.2, temperature_factors: JSON.stringify(g.temperatureFactors), hydration_heat: g.hydrationHeat, set_expansion_pct: 0.2, purity: 1 })
  t.lot = await id('plaster_lots', { grade_id: t.grade, lot_code: `G-${rnd()}`, bags_received: 3, bag_kg: 25, received_on: '2026-12-01' })
  t.bench = await id('benches', { name: `Guard ${rnd()}` })
  t.mould = await id('moulds', { code: `G-${rnd()}`, casts: 'Guard', material: 'silicone', cavity_litres: 1 })
  t.job = await id('jobs', { code: `G-${rnd()}`, title: 'Guard job' })
  t.item = await id('job_items', { job_id: t.job, description: 'Guard', profile: 'Guard', quantity: 1, pieces_needed: 1 })
  t.delItem = await id('job_items', { job_id: t.job, description: 'Guard', profile: 'Guard', quantity: 1, pieces_needed: 1 })
  t.sampleJob = await id('jobs', { code: `G-${rnd()}`, title: 'Guard sample', sample_required: true, sample_state: 'awaiting_cast' })
  t.decisionJob = await id('jobs', { code: `G-${rnd()}`, title: 'Guard decision', sample_required: true, sample_state: 'awaiting_approval' })
  const client1 = Number((await k('users').where({ email: demo.client1.email }).first('id')).id)
  await k('job_members').insert({ workshop_id: ws, job_id: t.decisionJob, user_id: client1 })
  t.clientJob = Number((await k('jobs').where({ workshop_id: ws, code: 'J-2601' }).first('id')).id)
  t.memberEmail = (await makeUser(ws, 'client', 'guard-member')).email
  t.memberId = (await makeUser(ws, 'client', 'guard-removed')).id
  await k('job_members').insert({ workshop_id: ws, job_id: t.job, user_id: t.memberId })
  t.photo = await leadPhoto(t.clientJob, true)
  t.dispatch = await id('dispatches', { job_id: t.job, note_no: `G-${rnd()}`, dispatched_at: new Date() })
  t.tablet = await id('tablet_devices', { name: 'Guard tablet', token_hash: `guard-${randomUUID()}` })
}

function routeFiles(dir: string): string[] {
  return readdirSync(dir).flatMap((f) => {
    const p = join(dir, f)
    return statSync(p).isDirectory() ? routeFiles(p) : [p]
  })
}

function fileToRoute(file: string, apiDir: string) {
  const rel = relative(apiDir, file).replace(/\.ts$/, '')
  const m = rel.match(/^(.*)\.(get|post|patch|put|delete)$/)
  if (!m) throw new Error(`route file without a method suffix: ${rel}`)
  const path = '/api/' + m[1]!.replace(/(^|\/)index$/, '')
  return `${m[2]!.toUpperCase()} ${path.replace(/\/$/, '')}`
}

const cookies: Partial<Record<Role, string>> = {}

beforeAll(async () => {
  cookies.lead = await signIn(demo.lead.email, DEMO_PASSWORD)
  cookies.caster = await signIn(demo.caster1.email, DEMO_PASSWORD)
  cookies.finisher = await signIn(demo.finisher.email, DEMO_PASSWORD)
  cookies.client = await signIn(demo.client1.email, DEMO_PASSWORD)
  patchTarget = (await makeUser(await demoWorkshopId(), 'caster', 'patch-target')).id
  await makeTargets()
})
afterAll(closeTestDb)

describe('route table', () => {
  it('names every route file under server/api', () => {
    const apiDir = join(import.meta.dirname, '../../server/api')
    const onDisk = routeFiles(apiDir).map(f => fileToRoute(f, apiDir)).sort()
    const inTable = ROUTES.map(r => `${r.method} ${r.path}`).sort()
    expect(inTable).toEqual(onDisk)
  })
})

describe('role guard', () => {
  // the decision target put client1 on an extra job; the tenancy checks below expect the demo's own
  afterAll(async () => {
    await testDb()('job_members').where({ job_id: t.decisionJob }).del()
  })
  for (const route of ROUTES.filter(r => r.roles !== 'public')) {
    it(`${route.method} ${route.path}: 401 signed out, 403 for other roles, allowed for ${(route.roles as Role[]).join(', ')}`, async () => {
      const path = route.target ? await route.target() : route.path
      const body = route.body ? await route.body() : undefined
      const form = route.form ? await route.form() : undefined
      expect((await call(path, { method: route.method, body, form })).status).toBe(401)
      for (const role of ['lead', 'caster', 'finisher', 'client'] as Role[]) {
        const target = route.freshTarget ? await route.target!() : path
        const r = await call(target, { method: route.method, cookie: cookies[role], body: route.body ? await route.body() : undefined, form: route.form ? await route.form() : undefined })
        if ((route.roles as Role[]).includes(role)) expect(r.status, `${role} should be allowed`).toBeLessThan(300)
        else expect(r.status, `${role} should be refused`).toBe(403)
      }
    })
  }
})

describe('tenancy', () => {
  it('one workshop cannot read or change another workshop\'s rows', async () => {
    const other = await makeOtherWorkshop()
    const otherLead = await signIn(other.lead.email, DEMO_PASSWORD)
    const users = await call<{ email: string }[]>('/api/users', { cookie: otherLead })
    expect(users.status).toBe(200)
    const emails = users.data.map(u => u.email).sort()
    expect(emails).toEqual([other.caster.email, other.client.email, other.lead.email].sort())
    const demoCaster = await call('/api/users', { cookie: cookies.lead })
    const idInDemo = demoCaster.data.find((u: { email: string }) => u.email === demo.caster1.email).id
    const patch = await call(`/api/users/${idInDemo}`, { method: 'PATCH', cookie: otherLead, body: { disabled: true } })
    expect(patch.status).toBe(404)
    const overview = await call('/api/overview', { cookie: otherLead })
    expect(overview.data.jobs.map((j: { code: string }) => j.code)).toEqual(['X-1'])
    const otherClient = await signIn(other.client.email, DEMO_PASSWORD)
    const jobs = await call('/api/client/jobs', { cookie: otherClient })
    expect(jobs.data.map((j: { code: string }) => j.code)).toEqual(['X-1'])
  })

  it('a client sees only the jobs they are a member of', async () => {
    const jobs1 = await call('/api/client/jobs', { cookie: cookies.client })
    expect(jobs1.data.map((j: { code: string }) => j.code).sort()).toEqual(['J-2601', 'J-2603'])
    const c2 = await signIn(demo.client2.email, DEMO_PASSWORD)
    const jobs2 = await call('/api/client/jobs', { cookie: c2 })
    expect(jobs2.data.map((j: { code: string }) => j.code)).toEqual(['J-2602'])
  })
})
