// Planning, moving and voiding pours: every refusal and warning rule, role, tenancy,
// validation naming the field, and two simultaneous bookings of one mould.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { io, type Socket } from 'socket.io-client'
import { baseUrl, call, signIn } from '../setup/http'
import { DEMO_PASSWORD, closeTestDb, demo, makeOtherWorkshop } from '../setup/fixtures'
import { boardFixture } from '../setup/board-fixtures'
import { batchForCavity } from '#shared/utils/plaster'
import { plasterGradeFromRow } from '#shared/utils/catalogue'
import { pourTimingFromSlotStart } from '#shared/utils/pour-timing'

// Monday 1 March 2027 (GMT, so local = UTC), far from the demo's days; shift 07:30–16:00.
const at = (hhmm: string, day = '2027-03-01') => `${day}T${hhmm}:00.000Z`
let lead = ''
let fx: Awaited<ReturnType<typeof boardFixture>>
let jobId = 0
let itemId = 0

beforeAll(async () => {
  lead = await signIn(demo.lead.email, DEMO_PASSWORD)
  fx = await boardFixture('pours')
  jobId = await fx.job()
  itemId = await fx.item(jobId, null)
})
afterAll(closeTestDb)

const post = (body: Record<string, unknown>, cookie = lead) => call('/api/pours', { method: 'POST', cookie, body })

describe('POST /api/pours', () => {
  it('plans a pour where it was dropped: timing at the shop temperature, batch with 5 % waste, an event', async () => {
    const mouldId = await fx.mould()
    const r = await post({ mouldId, slotStart: at('09:00'), jobItemId: itemId, casterId: fx.casterId })
    expect(r.status).toBe(201)
    const ws = await fx.k('workshops').where({ id: fx.workshopId }).first('default_shop_temp_c')
    const grade = plasterGradeFromRow(fx.grade)
    const t = pourTimingFromSlotStart({
      slotStart: new Date(at('09:00')), grade, consistency: 70, slurryTempC: Number(ws.default_shop_temp_c), setFactor: 1,
      mould: { prepMinutes: 10, cleanMinutes: 10, maxDwellMinutes: 240 },
    })
    const batch = batchForCavity({ cavityLitres: 2, consistency: 70, grade, wastePct: 5 })
    expect(r.data).toMatchObject({
      version: 1, mouldId, mouldCode: expect.stringContaining('-M'), jobItemId: itemId, jobId, casterId: fx.casterId, casterName: fx.casterName,
      gradeId: fx.gradeId, state: 'planned', isSample: false, consistency: 70, setFactor: 1,
      slotStart: at('09:00'), mixAt: t.mixAt.toISOString(), demouldOpenAt: t.demouldOpenAt.toISOString(),
      demouldCloseAt: t.demouldCloseAt.toISOString(), slotEnd: t.slotEnd.toISOString(), warnings: [], overdue: false,
    })
    expect(r.data.plasterKg).toBeCloseTo(batch.plasterKg, 3)
    expect(r.data.waterKg).toBeCloseTo(batch.waterKg, 3)
    const ev = await fx.k('events').where({ entity: 'pour', entity_id: String(r.data.id) }).select('type', 'actor_id')
    expect(ev.map(e => e.type)).toEqual(['pour.planned'])
  })

  it('defaults grade and consistency from the workshop\'s first grade without an item', async () => {
    const mouldId = await fx.mould()
    const first = await fx.k('plaster_grades').where({ workshop_id: fx.workshopId }).whereNull('archived_at').orderBy('id').first('id', 'consistency_default')
    const r = await post({ mouldId, slotStart: at('09:00') })
    expect(r.status).toBe(201)
    expect(r.data.gradeId).toBe(Number(first.id))
    expect(r.data.consistency).toBe(Number(first.consistency_default))
  })

  it('refuses an overlap on the mould, naming when it is taken', async () => {
    const mouldId = await fx.mould()
    expect((await post({ mouldId, slotStart: at('10:00') })).status).toBe(201)
    const r = await post({ mouldId, slotStart: at('10:20') })
    expect(r.status).toBe(409)
    expect(r.data.message).toMatch(/This mould is already taken from Mon 1 Mar 2027 10:00 to Mon 1 Mar 2027 \d\d:\d\d/)
  })

  it('refuses a mould in repair or retired', async () => {
    for (const state of ['repair', 'retired']) {
      const mouldId = await fx.mould({ state })
      const r = await post({ mouldId, slotStart: at('09:00') })
      expect(r.status, state).toBe(409)
      expect(r.data.message).toContain(state === 'repair' ? 'repair' : 'retire')
    }
  })

  it('refuses an item whose job waits for sample approval, unless the pour is the sample', async () => {
    const mouldId = await fx.mould()
    const waiting = await fx.job({ sample_required: true, sample_state: 'awaiting_approval' })
    const item = await fx.item(waiting, mouldId)
    const r = await post({ mouldId, slotStart: at('08:00'), jobItemId: item })
    expect(r.status).toBe(409)
    expect(r.data.message).toContain('sample approval')
    const sample = await post({ mouldId, slotStart: at('08:00'), jobItemId: item, isSample: true })
    expect(sample.status).toBe(201)
    expect(sample.data.isSample).toBe(true)
    const approved = await fx.job({ sample_required: true, sample_state: 'approved' })
    expect((await post({ mouldId, slotStart: at('11:00'), jobItemId: await fx.item(approved, mouldId) })).status).toBe(201)
  })

  it('warns when the caster gauges two mixes at once', async () => {
    const [a, b] = [await fx.mould(), await fx.mould()]
    expect((await post({ mouldId: a, slotStart: at('13:00'), casterId: fx.caster2Id })).data.warnings).toEqual([])
    const r = await post({ mouldId: b, slotStart: at('13:02'), casterId: fx.caster2Id })
    expect(r.status).toBe(201)
    expect(r.data.warnings.join(' ')).toContain('two mixes at once')
    const apart = await post({ mouldId: b, slotStart: at('15:00', '2027-03-02'), casterId: fx.caster2Id })
    expect(apart.data.warnings).toEqual([])
  })

  it('warns when a window opens after the shift on a mould that cannot hold the cast overnight', async () => {
    const short = await fx.mould({ max_dwell_minutes: 30 })
    const r = await post({ mouldId: short, slotStart: at('15:45') })
    expect(r.status).toBe(201)
    expect(r.data.warnings.join(' ')).toContain('cannot hold the cast overnight')
    const long = await fx.mould({ max_dwell_minutes: 1200 })
    expect((await post({ mouldId: long, slotStart: at('15:45') })).data.warnings).toEqual([])
  })

  it('warns when a pour placed by hand mixes into a shift break, and not once moved clear', async () => {
    await fx.k('workshops').where({ id: fx.workshopId }).update({ shift_breaks: JSON.stringify([{ start: '10:00', end: '10:20' }]) })
    try {
      const mouldId = await fx.mould()
      const r = await post({ mouldId, slotStart: at('10:00', '2027-03-03') })
      expect(r.status).toBe(201)
      const mixAt = new Date(r.data.mixAt)
      // the mix falls after the mould prep, inside the 10:00–10:20 break
      expect(mixAt.getTime()).toBeGreaterThan(Date.parse(at('10:00', '2027-03-03')))
      expect(mixAt.getTime()).toBeLessThan(Date.parse(at('10:20', '2027-03-03')))
      expect(r.data.warnings.join(' ')).toContain('runs into the 10:00–10:20 break')
      const moved = await call(`/api/pours/${r.data.id}`, { method: 'PATCH', cookie: lead, body: { version: r.data.version, mouldId, slotStart: at('10:30', '2027-03-03') } })
      expect(moved.status, JSON.stringify(moved.data)).toBe(200)
      expect(moved.data.warnings.join(' ')).not.toContain('break')
    }
    finally {
      await fx.k('workshops').where({ id: fx.workshopId }).update({ shift_breaks: '[]' })
    }
  })

  it('warns when the mould passes its expected life', async () => {
    const worn = await fx.mould({ pulls: 98, expected_pulls: 100 })
    expect((await post({ mouldId: worn, slotStart: at('08:00') })).data.warnings).toEqual([])
    const r = await post({ mouldId: worn, slotStart: at('12:00') })
    expect(r.data.warnings.join(' ')).toContain('expected life')
  })

  it('warns when the lot will not cover the plaster', async () => {
    const mouldId = await fx.mould()
    const small = await fx.lot({ bags_received: 0 })
    const r = await post({ mouldId, slotStart: at('08:00'), lotId: small })
    expect(r.status).toBe(201)
    expect(r.data.warnings.join(' ')).toMatch(/will not cover .* short/)
    const big = await fx.lot({ bags_received: 40 })
    expect((await post({ mouldId, slotStart: at('12:00'), lotId: big })).data.warnings).toEqual([])
  })

  it('carries the plaster model\'s own warnings', async () => {
    const mouldId = await fx.mould()
    const r = await post({ mouldId, slotStart: at('08:00'), setFactor: 4 })
    expect(r.status).toBe(201)
    expect(r.data.warnings.length).toBeGreaterThan(0)
  })

  it('names each bad field with 422', async () => {
    const mouldId = await fx.mould()
    const ok = { mouldId, slotStart: at('09:00') }
    const cases: [Record<string, unknown>, string][] = [
      [{ ...ok, mouldId: 'x' }, 'mouldId'],
      [{ slotStart: ok.slotStart }, 'mouldId'],
      [{ ...ok, slotStart: 'tomorrow' }, 'slotStart'],
      [{ ...ok, jobItemId: -1 }, 'jobItemId'],
      [{ ...ok, casterId: 1.5 }, 'casterId'],
      [{ ...ok, gradeId: 0 }, 'gradeId'],
      [{ ...ok, consistency: 5 }, 'consistency'],
      [{ ...ok, setFactor: 0 }, 'setFactor'],
      [{ ...ok, lotId: 'a' }, 'lotId'],
      [{ ...ok, isSample: 'yes' }, 'isSample'],
      [{ ...ok, casterId: 999999999 }, 'casterId'],
      [{ ...ok, gradeId: 999999999 }, 'gradeId'],
    ]
    for (const [body, field] of cases) {
      const r = await post(body)
      expect(r.status, field).toBe(422)
      expect(r.data.data.problems[0].field, JSON.stringify(body)).toBe(field)
    }
  })

  it('only a lead plans', async () => {
    const mouldId = await fx.mould()
    for (const who of [demo.caster1, demo.finisher, demo.client1]) {
      expect((await post({ mouldId, slotStart: at('09:00') }, await signIn(who.email, DEMO_PASSWORD))).status).toBe(403)
    }
  })
})

describe('tenancy', () => {
  it('another workshop\'s mould, item, caster, grade or lot is a 422 naming it; its pour a 404', async () => {
    const other = await makeOtherWorkshop()
    const k = fx.k
    const { id: _id, created_at: _c, updated_at: _u, ...gradeRow } = fx.grade
    const [grade] = await k('plaster_grades').insert({ ...gradeRow, workshop_id: other.workshopId, temperature_factors: JSON.stringify(fx.grade.temperature_factors) }).returning('id')
    const [mould] = await k('moulds').insert({ workshop_id: other.workshopId, code: 'OT-1', casts: 'x', material: 'silicone', cavity_litres: 1 }).returning('id')
    const [item] = await k('job_items').insert({ workshop_id: other.workshopId, job_id: other.jobId, description: 'x', pieces_needed: 1 }).returning('id')
    const [lot] = await k('plaster_lots').insert({ workshop_id: other.workshopId, grade_id: grade.id, lot_code: 'OT-L', bags_received: 1, bag_kg: 25, received_on: '2026-01-01' }).returning('id')
    const mine = await fx.mould()
    const cases: [Record<string, unknown>, string][] = [
      [{ mouldId: Number(mould.id) }, 'mouldId'],
      [{ mouldId: mine, jobItemId: Number(item.id) }, 'jobItemId'],
      [{ mouldId: mine, casterId: other.caster.id }, 'casterId'],
      [{ mouldId: mine, gradeId: Number(grade.id) }, 'gradeId'],
      [{ mouldId: mine, lotId: Number(lot.id) }, 'lotId'],
    ]
    for (const [body, field] of cases) {
      const r = await post({ slotStart: at('09:00', '2027-03-03'), ...body })
      expect(r.status, field).toBe(422)
      expect(r.data.data.problems[0].field).toBe(field)
    }
    const theirs = await post({ mouldId: Number(mould.id), slotStart: at('09:00', '2027-03-03') }, await signIn(other.lead.email, DEMO_PASSWORD))
    expect(theirs.status).toBe(201)
    const move = await call(`/api/pours/${theirs.data.id}`, { method: 'PATCH', cookie: lead, body: { version: 1, slotStart: at('10:00', '2027-03-03') } })
    expect(move.status).toBe(404)
    const voided = await call(`/api/pours/${theirs.data.id}/void`, { method: 'POST', cookie: lead, body: { version: 1, reason: 'x' } })
    expect(voided.status).toBe(404)
  })
})

describe('PATCH /api/pours/[id]', () => {
  it('moves a planned pour, recomputes its warnings, bumps the version and records the move', async () => {
    const [a, short] = [await fx.mould(), await fx.mould({ max_dwell_minutes: 30 })]
    const p = (await post({ mouldId: a, slotStart: at('09:00', '2027-03-04') })).data
    const r = await call(`/api/pours/${p.id}`, { method: 'PATCH', cookie: lead, body: { version: 1, mouldId: short, slotStart: at('15:45', '2027-03-04') } })
    expect(r.status).toBe(200)
    expect(r.data).toMatchObject({ id: p.id, version: 2, mouldId: short, slotStart: at('15:45', '2027-03-04') })
    expect(r.data.warnings.join(' ')).toContain('overnight')
    const ev = await fx.k('events').where({ entity: 'pour', entity_id: String(p.id) }).orderBy('id').pluck('type')
    expect(ev).toEqual(['pour.planned', 'pour.moved'])
    const stale = await call(`/api/pours/${p.id}`, { method: 'PATCH', cookie: lead, body: { version: 1, slotStart: at('08:00', '2027-03-04') } })
    expect(stale.status).toBe(409)
    expect(stale.data.message).toContain('changed by someone else')
  })

  it('refuses a move onto a taken slot, keeping the pour where it was', async () => {
    const m = await fx.mould()
    await post({ mouldId: m, slotStart: at('09:00', '2027-03-04') })
    const p = (await post({ mouldId: m, slotStart: at('12:00', '2027-03-04') })).data
    const r = await call(`/api/pours/${p.id}`, { method: 'PATCH', cookie: lead, body: { version: 1, slotStart: at('09:10', '2027-03-04') } })
    expect(r.status).toBe(409)
    expect(r.data.message).toContain('This mould is already taken')
    const row = await fx.k('pours').where({ id: p.id }).first('version')
    expect(row.version).toBe(1)
  })

  it('only planned pours move: 409 naming the state', async () => {
    const m = await fx.mould()
    const p = (await post({ mouldId: m, slotStart: at('09:00', '2027-03-05') })).data
    await fx.k('pours').where({ id: p.id }).update({ state: 'setting' })
    const r = await call(`/api/pours/${p.id}`, { method: 'PATCH', cookie: lead, body: { version: 1, slotStart: at('11:00', '2027-03-05') } })
    expect(r.status).toBe(409)
    expect(r.data.message).toContain('setting')
  })

  it('names bad fields, 404 for no such pour, 403 for a caster', async () => {
    const m = await fx.mould()
    const p = (await post({ mouldId: m, slotStart: at('09:00', '2027-03-08') })).data
    for (const [body, field] of [[{}, 'version'], [{ version: 1, slotStart: 'x' }, 'slotStart'], [{ version: 1, consistency: 500 }, 'consistency']] as const) {
      const r = await call(`/api/pours/${p.id}`, { method: 'PATCH', cookie: lead, body })
      expect(r.status, field).toBe(422)
      expect(r.data.data.problems[0].field).toBe(field)
    }
    expect((await call('/api/pours/abc', { method: 'PATCH', cookie: lead, body: { version: 1 } })).data.data.problems[0].field).toBe('params.id')
    expect((await call('/api/pours/999999999', { method: 'PATCH', cookie: lead, body: { version: 1 } })).status).toBe(404)
    const caster = await signIn(demo.caster1.email, DEMO_PASSWORD)
    expect((await call(`/api/pours/${p.id}`, { method: 'PATCH', cookie: caster, body: { version: 1 } })).status).toBe(403)
  })
})

describe('POST /api/pours/[id]/void', () => {
  it('voids a planned pour with a reason and frees its slot', async () => {
    const m = await fx.mould()
    const p = (await post({ mouldId: m, slotStart: at('09:00', '2027-03-09') })).data
    expect((await call(`/api/pours/${p.id}/void`, { method: 'POST', cookie: lead, body: { version: 1, reason: '' } })).data.data.problems[0].field).toBe('reason')
    const stale = await call(`/api/pours/${p.id}/void`, { method: 'POST', cookie: lead, body: { version: 7, reason: 'x' } })
    expect(stale.status).toBe(409)
    const r = await call(`/api/pours/${p.id}/void`, { method: 'POST', cookie: lead, body: { version: 1, reason: 'Client moved the date' } })
    expect(r.status).toBe(200)
    expect(r.data).toMatchObject({ state: 'void', version: 2 })
    const again = await call(`/api/pours/${p.id}/void`, { method: 'POST', cookie: lead, body: { version: 2, reason: 'x' } })
    expect(again.status).toBe(409)
    expect(again.data.message).toContain('void')
    expect((await post({ mouldId: m, slotStart: at('09:00', '2027-03-09') })).status).toBe(201)
    const ev = await fx.k('events').where({ entity: 'pour', entity_id: String(p.id) }).orderBy('id').pluck('type')
    expect(ev).toEqual(['pour.planned', 'pour.voided'])
  })
})

describe('concurrency', () => {
  it('two simultaneous bookings of one mould: exactly one 201 and one 409', async () => {
    for (let round = 0; round < 3; round++) {
      const m = await fx.mould()
      const results = await Promise.all([
        post({ mouldId: m, slotStart: at('09:00', '2027-03-10') }),
        post({ mouldId: m, slotStart: at('09:05', '2027-03-10') }),
      ])
      expect(results.map(r => r.status).sort()).toEqual([201, 409])
      expect(results.find(r => r.status === 409)!.data.message).toContain('This mould is already taken')
      const n = await fx.k('pours').where({ mould_id: m }).whereNot('state', 'void').count({ n: '*' }).first()
      expect(Number(n!.n)).toBe(1)
    }
  })
})

describe('live updates', () => {
  it('staff hear pour.created, pour.updated and pour.voided with the PourDto', async () => {
    const caster = await signIn(demo.caster1.email, DEMO_PASSWORD)
    const s: Socket = io(baseUrl(), { path: '/socket.io/', transports: ['websocket'], extraHeaders: { cookie: caster }, reconnection: false, forceNew: true })
    try {
      await new Promise((resolve, reject) => {
        s.once('connect', () => resolve(null))
        s.once('connect_error', reject)
      })
      const seen: { type: string; id: number; version: number; row: { id: number; state: string } }[] = []
      s.on('live', e => seen.push(e))
      const m = await fx.mould()
      const p = (await post({ mouldId: m, slotStart: at('09:00', '2027-03-11') })).data
      await call(`/api/pours/${p.id}`, { method: 'PATCH', cookie: lead, body: { version: 1, slotStart: at('10:00', '2027-03-11') } })
      await call(`/api/pours/${p.id}/void`, { method: 'POST', cookie: lead, body: { version: 2, reason: 'test' } })
      await expect.poll(() => seen.filter(e => e.id === p.id).length, { timeout: 5000 }).toBeGreaterThanOrEqual(3)
      const mine = seen.filter(e => e.id === p.id)
      expect(mine.map(e => [e.type, e.version, e.row.state])).toEqual([['pour.created', 1, 'planned'], ['pour.updated', 2, 'planned'], ['pour.voided', 3, 'void']])
    }
    finally {
      s.close()
    }
  })
})
