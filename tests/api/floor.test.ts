// The floor's pour actions and today's cards: order of steps, roles, exactly-once replays,
// version conflicts, back-dating, the piece and the mould's pull on demould, calibration,
// tenancy and validation naming the field.
import { randomUUID } from 'node:crypto'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { call, expectStaleStepRefused, signIn } from '../setup/http'
import { DEMO_PASSWORD, closeTestDb, demo, makeOtherWorkshop } from '../setup/fixtures'
import { boardFixture } from '../setup/board-fixtures'
import { castFromBatch, slurryTemperature } from '#shared/utils/plaster'
import { plasterGradeFromRow } from '#shared/utils/catalogue'
import { pourTiming } from '#shared/utils/pour-timing'

let lead = ''
let caster = ''
let fx: Awaited<ReturnType<typeof boardFixture>>
let itemId = 0
let jobCode = ''

beforeAll(async () => {
  lead = await signIn(demo.lead.email, DEMO_PASSWORD)
  caster = await signIn(demo.caster1.email, DEMO_PASSWORD)
  fx = await boardFixture('floor')
  const jobId = await fx.job()
  jobCode = (await fx.k('jobs').where({ id: jobId }).first('code')).code
  itemId = await fx.item(jobId, null)
})
afterAll(closeTestDb)

/** A planned pour on a fresh mould (a Wednesday past the board journey's quiet Mondays, unless `slotStart` says otherwise), for caster 1. */
async function plannedPour(slotStart = '2028-04-05T09:00:00Z', casterId = fx.casterId) {
  const mouldId = await fx.mould()
  const r = await call('/api/pours', { method: 'POST', cookie: lead, body: { mouldId, slotStart, jobItemId: itemId, casterId } })
  expect(r.status, JSON.stringify(r.data)).toBe(201)
  return r.data as { id: number; version: number; mouldId: number; mouldCode: string }
}

const act = (pourId: number, body: Record<string, unknown>, cookie = caster) =>
  call(`/api/pours/${pourId}/actions`, { method: 'POST', cookie, body: { actionId: randomUUID(), ...body } })
const start = (pourId: number, extra: Record<string, unknown> = {}) => act(pourId, { kind: 'start_mixing', version: 1, waterTempC: 18, ...extra })
const pour = (pourId: number, extra: Record<string, unknown> = {}) => act(pourId, { kind: 'poured', version: 2, plasterKg: 2.9, waterKg: 2.03, shopTempC: 17, ...extra })
const row = (id: number) => fx.k('pours').where({ id }).first()
const events = (id: number) => fx.k('events').where({ entity: 'pour', entity_id: String(id) }).orderBy('id').select('type', 'backdated', 'at', 'actor_id', 'data')

describe('POST /api/pours/:id/actions: start mixing', () => {
  it('moves a planned pour to mixing, restarts its clock at the real start, records an event and the action', async () => {
    const p = await plannedPour()
    const lot = await fx.lot()
    const r = await start(p.id, { lotId: lot, powderTempC: 16 })
    expect(r.status, JSON.stringify(r.data)).toBe(200)
    expect(r.data.card.pour).toMatchObject({ id: p.id, state: 'mixing', version: 2, lotId: lot })
    const db = await row(p.id)
    expect(db.mixing_at).toBeInstanceOf(Date)
    expect(Number(db.slurry_temp_c)).toBeCloseTo(slurryTemperature({ plasterKg: Number(db.plaster_kg_planned), waterKg: Number(db.water_kg_planned), waterTempC: 18, powderTempC: 16 }), 2)
    expect(new Date(r.data.card.pour.demouldOpenAt).getTime()).toBeGreaterThan(db.mixing_at.getTime())
    const ev = await events(p.id)
    expect(ev.map(e => e.type)).toEqual(['pour.planned', 'pour.mixing'])
    expect(ev[1]).toMatchObject({ backdated: false, actor_id: String(fx.casterId) })
    expect((await fx.k('moulds').where({ id: p.mouldId }).first('state')).state).toBe('in_use')
  })

  it('the same actionId sent three times (two at once) changes the pour once and answers the same', async () => {
    const p = await plannedPour()
    const body = { actionId: randomUUID(), kind: 'start_mixing', version: 1, waterTempC: 19 }
    const send = () => call(`/api/pours/${p.id}/actions`, { method: 'POST', cookie: caster, body })
    const [a, b] = await Promise.all([send(), send()])
    const c = await send()
    expect([a.status, b.status, c.status]).toEqual([200, 200, 200])
    expect(b.data).toEqual(a.data)
    expect(c.data).toEqual(a.data)
    expect(c.headers.get('x-setline-replayed')).toBe('1')
    expect((await row(p.id)).version).toBe(2)
    expect((await events(p.id)).filter(e => e.type === 'pour.mixing')).toHaveLength(1)
    expect(await fx.k('processed_actions').where({ id: body.actionId }).first('status', 'kind')).toEqual({ status: 200, kind: 'pour.start_mixing' })
  })

  it('refuses a stale version with 409, and its replay gets the same 409 without a change', async () => {
    const p = await plannedPour()
    await call(`/api/pours/${p.id}`, { method: 'PATCH', cookie: lead, body: { version: 1, slotStart: '2028-04-05T10:00:00Z' } })
    await expectStaleStepRefused(`/api/pours/${p.id}/actions`, caster, { kind: 'start_mixing', version: 1, waterTempC: 18 })
    expect((await row(p.id)).state).toBe('planned')
  })

  it('keeps a back-dated start as such: the real time on the pour and the event, flagged backdated', async () => {
    const p = await plannedPour()
    const at = new Date(Date.now() - 20 * 60_000).toISOString()
    const r = await start(p.id, { at })
    expect(r.status).toBe(200)
    const db = await row(p.id)
    expect(db.mixing_at.toISOString()).toBe(at)
    expect(db.backdated).toBe(true)
    const ev = (await events(p.id)).at(-1)!
    expect(ev).toMatchObject({ type: 'pour.mixing', backdated: true })
    expect(ev.at.toISOString()).toBe(at)
    expect((await start(p.id, { at: new Date(Date.now() + 3_600_000).toISOString(), version: 2 })).status).toBe(409)
  })

  it('refuses a time in the future and a lot of another grade (422 naming the field)', async () => {
    const p = await plannedPour()
    const future = await start(p.id, { at: new Date(Date.now() + 3_600_000).toISOString() })
    expect(future.status).toBe(422)
    expect(future.data.data.problems[0].field).toBe('at')
    const other = await fx.k('plaster_grades').where({ workshop_id: fx.workshopId }).whereNot({ id: fx.gradeId }).first('id')
    if (other) {
      const lot = await fx.lot({ grade_id: other.id })
      const r = await start(p.id, { lotId: lot })
      expect(r.status).toBe(422)
      expect(r.data.data.problems[0].field).toBe('lotId')
    }
  })
})

describe('POST /api/pours/:id/actions: the order of steps', () => {
  it('refuses a step out of order with 409 naming the current state', async () => {
    const p = await plannedPour()
    const r = await pour(p.id, { version: 1 })
    expect(r.status).toBe(409)
    expect(r.data.message).toMatch(/already planned/)
    const d = await act(p.id, { kind: 'demoulded', version: 1, result: 'sound' })
    expect(d.status).toBe(409)
    expect(d.data.message).toMatch(/needs setting/)
  })

  it('poured recomputes the window from the actual weights and slurry temperature; demoulded makes the piece', async () => {
    const p = await plannedPour()
    const mixAt = new Date(Date.now() - 50 * 60_000)
    expect((await start(p.id, { at: mixAt.toISOString() })).status).toBe(200)
    const poured = await pour(p.id, { at: new Date(mixAt.getTime() + 6 * 60_000).toISOString() })
    expect(poured.status, JSON.stringify(poured.data)).toBe(200)
    const grade = plasterGradeFromRow(fx.grade)
    const slurryTempC = slurryTemperature({ plasterKg: 2.9, waterKg: 2.03, waterTempC: 18, powderTempC: 17 })
    const t = pourTiming({ mixAt, grade, consistency: 70, slurryTempC, setFactor: 1, mould: { prepMinutes: 10, cleanMinutes: 10, maxDwellMinutes: 240 } })
    expect(poured.data.card.pour).toMatchObject({ state: 'setting', version: 3, demouldOpenAt: t.demouldOpenAt.toISOString(), demouldCloseAt: t.demouldCloseAt.toISOString() })
    expect(poured.data.card.actual).toMatchObject({ plasterKg: 2.9, waterKg: 2.03, shopTempC: 17 })
    const before = await fx.k('moulds').where({ id: p.mouldId }).first('pulls')
    const d = await act(p.id, { kind: 'demoulded', version: 3, result: 'sound' })
    expect(d.status, JSON.stringify(d.data)).toBe(200)
    // the mark scheme: job code as written, '#', the piece's number within the job (this one included)
    const ofJob = await fx.k('pieces').where({ workshop_id: fx.workshopId }).where('mark', 'like', `${jobCode}#%`).count({ n: '*' })
    const mark = `${jobCode}#${String(Number(ofJob[0]!.n)).padStart(3, '0')}`
    expect(d.data.piece.mark).toBe(mark)
    const piece = await fx.k('pieces').where({ pour_id: p.id }).first()
    const cast = castFromBatch({ plasterKg: 2.9 / 1.05, waterKg: 2.03 / 1.05, grade })
    expect(piece).toMatchObject({ mark, state: 'to_fettle', job_item_id: String(itemId) })
    expect(Number(piece.dry_mass_kg)).toBeCloseTo(cast.dryMassKg, 3)
    expect(Number(piece.wet_mass_kg)).toBeCloseTo(cast.wetMassKg, 3)
    const mould = await fx.k('moulds').where({ id: p.mouldId }).first('pulls', 'state')
    expect(mould).toEqual({ pulls: before.pulls + 1, state: 'cleaning' })
    const db = await row(p.id)
    expect(Number(db.actual_demould_minutes)).toBeGreaterThan(49)
    expect(Number(db.predicted_demould_minutes)).toBeGreaterThan(0)
    const g = await fx.k('plaster_grades').where({ id: fx.gradeId }).first('calibration_factor', 'calibration_count')
    expect(g.calibration_count).toBeGreaterThanOrEqual(1)
    expect(Number(g.calibration_factor)).toBeGreaterThan(0)
    expect((await events(p.id)).map(e => e.type)).toEqual(['pour.planned', 'pour.mixing', 'pour.poured', 'pour.demoulded'])
    expect(await fx.k('events').where({ entity: 'piece', entity_id: String(piece.id) }).pluck('type')).toEqual(['piece.created'])
  })

  it('a second tablet demoulding the same pour gets 409, and so does its replay', async () => {
    const p = await plannedPour()
    await start(p.id)
    await pour(p.id)
    const first = await act(p.id, { kind: 'demoulded', version: 3, result: 'defect', defect: 'air holes' })
    expect(first.status).toBe(200)
    expect((await fx.k('pieces').where({ pour_id: p.id }).first('state')).state).toBe('repair')
    const body = { actionId: randomUUID(), kind: 'demoulded', version: 3, result: 'sound' }
    const second = await call(`/api/pours/${p.id}/actions`, { method: 'POST', cookie: lead, body })
    expect(second.status).toBe(409)
    expect(second.data.message).toMatch(/already demoulded/)
    const replay = await call(`/api/pours/${p.id}/actions`, { method: 'POST', cookie: lead, body })
    expect(replay.status).toBe(409)
    expect(replay.data.message).toBe(second.data.message)
    expect(await fx.k('pieces').where({ pour_id: p.id }).count({ n: '*' })).toEqual([{ n: '1' }])
    expect(await fx.k('processed_actions').where({ id: body.actionId }).first('status')).toEqual({ status: 409 })
  })
})

describe('POST /api/pours/:id/actions: who, where, what', () => {
  it('lets casters and leads mark pours; a finisher or client gets 403, signed out 401', async () => {
    const p = await plannedPour()
    expect((await start(p.id, {})).status).toBe(200)
    expect((await pour(p.id, {})).status).toBe(200)
    expect((await act(p.id, { kind: 'demoulded', version: 3, result: 'sound' }, lead)).status).toBe(200)
    const q = await plannedPour()
    expect((await start(q.id, {})).status).toBe(200)
    for (const email of [demo.finisher.email, demo.client1.email]) {
      expect((await act(q.id, { kind: 'poured', version: 2, plasterKg: 2, waterKg: 1.4, shopTempC: 18 }, await signIn(email, DEMO_PASSWORD))).status).toBe(403)
    }
    expect((await act(q.id, { kind: 'poured', version: 2, plasterKg: 2, waterKg: 1.4, shopTempC: 18 }, '')).status).toBe(401)
  })

  it('another workshop\'s pour is a 404, and nothing is recorded', async () => {
    const p = await plannedPour()
    const other = await makeOtherWorkshop()
    const otherCaster = await signIn(other.caster.email, DEMO_PASSWORD)
    const body = { actionId: randomUUID(), kind: 'start_mixing', version: 1, waterTempC: 18 }
    const r = await call(`/api/pours/${p.id}/actions`, { method: 'POST', cookie: otherCaster, body })
    expect(r.status).toBe(404)
    expect((await row(p.id)).state).toBe('planned')
    expect(await fx.k('processed_actions').where({ id: body.actionId }).first()).toBeUndefined()
  })

  it('names the bad field with 422', async () => {
    const p = await plannedPour()
    const cases: [Record<string, unknown>, string][] = [
      [{ kind: 'start_mixing', version: 1, waterTempC: 'warm' }, 'waterTempC'],
      [{ kind: 'start_mixing', version: 1, waterTempC: 18, actionId: 'not-a-uuid' }, 'actionId'],
      [{ kind: 'start_mixing', version: 0, waterTempC: 18 }, 'version'],
      [{ kind: 'poured', version: 2, plasterKg: -1, waterKg: 1, shopTempC: 18 }, 'plasterKg'],
      [{ kind: 'poured', version: 2, plasterKg: 2, waterKg: 1, shopTempC: 90 }, 'shopTempC'],
      [{ kind: 'demoulded', version: 3, result: 'defect' }, 'defect'],
      [{ kind: 'demoulded', version: 3, result: 'sound', defect: 'gremlins' }, 'defect'],
      [{ kind: 'demoulded', version: 3, result: 'maybe' }, 'result'],
      [{ kind: 'start_mixing', version: 1, waterTempC: 18, at: 'yesterday' }, 'at'],
    ]
    for (const [body, field] of cases) {
      const r = await act(p.id, body)
      expect(r.status, `${field}: ${JSON.stringify(r.data)}`).toBe(422)
      expect(r.data.data.problems.map((x: { field: string }) => x.field), JSON.stringify(body)).toContain(field)
    }
    const kind = await act(p.id, { kind: 'cure', version: 1 })
    expect(kind.status).toBe(422)
    expect(kind.data.message).toMatch(/kind/)
    expect((await start(p.id)).status).toBe(200)
    const thin = await pour(p.id, { plasterKg: 2, waterKg: 0.2 })
    expect(thin.status).toBe(422)
    expect(thin.data.data.problems[0].field).toBe('waterKg')
  })
})

describe('GET /api/floor/today', () => {
  it('gives a caster their own pours of today as cards; a lead all, or one caster\'s', async () => {
    const now = new Date(Math.floor(Date.now() / 60_000) * 60_000).toISOString()
    const mine = await plannedPour(now, fx.casterId)
    const theirs = await plannedPour(now, fx.caster2Id)
    await fx.lot()
    const r = await call('/api/floor/today', { cookie: caster })
    expect(r.status).toBe(200)
    const ids = r.data.cards.map((c: { pour: { id: number } }) => c.pour.id)
    expect(ids).toContain(mine.id)
    expect(ids).not.toContain(theirs.id)
    const card = r.data.cards.find((c: { pour: { id: number } }) => c.pour.id === mine.id)
    expect(card).toMatchObject({ mould: { code: mine.mouldCode, cavityLitres: 2 }, bench: { id: fx.benchId }, actual: { mixingAt: null } })
    expect(card.pour.plasterKg).toBeGreaterThan(0)
    expect(card.lots.length).toBeGreaterThan(0)
    expect(card.cautions).toContain('dust')
    const all = await call('/api/floor/today', { cookie: lead })
    expect(all.data.cards.map((c: { pour: { id: number } }) => c.pour.id)).toEqual(expect.arrayContaining([mine.id, theirs.id]))
    const one = await call(`/api/floor/today?casterId=${fx.caster2Id}`, { cookie: lead })
    expect(one.data.cards.every((c: { pour: { casterId: number } }) => c.pour.casterId === fx.caster2Id)).toBe(true)
    const bad = await call('/api/floor/today?casterId=abc', { cookie: lead })
    expect(bad.status).toBe(422)
    expect(bad.data.data.problems[0].field).toBe('query.casterId')
    expect((await call('/api/floor/today', { cookie: await signIn(demo.finisher.email, DEMO_PASSWORD) })).status).toBe(403)
  })
})
