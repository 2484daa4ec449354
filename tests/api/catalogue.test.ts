// Catalogue routes: plaster grades, lots, benches, moulds. Role (only a lead writes), tenancy,
// validation (422 naming the field), conflicts (duplicate code, stale version → 409) and the
// happy paths, against the built server and a real PostgreSQL.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { call, signIn } from '../setup/http'
import { DEMO_PASSWORD, closeTestDb, demo, demoWorkshopId, makeOtherWorkshop, testDb } from '../setup/fixtures'
import { GRADE_PRESETS, plasterGradeFromPreset } from '#shared/utils/plaster'

let lead = ''
let caster = ''
let client = ''
const uid = () => Math.random().toString(36).slice(2, 8).toUpperCase()

beforeAll(async () => {
  lead = await signIn(demo.lead.email, DEMO_PASSWORD)
  caster = await signIn(demo.caster1.email, DEMO_PASSWORD)
  client = await signIn(demo.client1.email, DEMO_PASSWORD)
})
afterAll(closeTestDb)

function gradeBody(name = `Test grade ${uid()}`) {
  const { label: _label, ...grade } = plasterGradeFromPreset('beta-casting')
  return { name, presetKey: 'beta-casting', bagKg: 25, grade }
}
const mouldBody = (code = `T-${uid()}`) => ({ code, casts: 'Test cornice length', material: 'silicone', cavityLitres: 5, castLengthM: 1.2, prepMinutes: 10, cleanMinutes: 10, maxDwellMinutes: 120, pulls: 0, expectedPulls: 100 })

describe('plaster grades', () => {
  it('a lead creates a grade from a preset, edits it with its version and archives it', async () => {
    const created = await call('/api/grades', { method: 'POST', cookie: lead, body: gradeBody() })
    expect(created.status).toBe(201)
    expect(created.data).toMatchObject({ presetKey: 'beta-casting', plaster: { consistency: { default: 70 } }, calibration: { count: 0 }, version: 1 })
    const edited = await call(`/api/grades/${created.data.id}`, { method: 'PATCH', cookie: lead, body: { bagKg: 22.5, version: 1 } })
    expect(edited.status).toBe(200)
    expect(edited.data).toMatchObject({ bagKg: 22.5, version: 2 })
    const stale = await call(`/api/grades/${created.data.id}`, { method: 'PATCH', cookie: lead, body: { bagKg: 20, version: 1 } })
    expect(stale.status).toBe(409)
    expect(stale.data.message).toMatch(/changed by someone else/)
    const archived = await call(`/api/grades/${created.data.id}`, { method: 'PATCH', cookie: lead, body: { archived: true, version: 2 } })
    expect(archived.data.archivedAt).toBeTruthy()
  })

  it('names each bad field with 422 and refuses a duplicate name with 409', async () => {
    const cases: [Record<string, unknown>, string][] = [
      [{ name: '' }, 'name'],
      [{ bagKg: 0 }, 'bagKg'],
      [{ presetKey: 'gold' }, 'presetKey'],
      [{ grade: { ...gradeBody().grade, powderDensity: 9 } }, 'grade.powderDensity'],
      [{ grade: { ...gradeBody().grade, consistency: { min: 60, max: 80, default: 90 } } }, 'grade.consistency.default'],
    ]
    for (const [patch, field] of cases) {
      const r = await call('/api/grades', { method: 'POST', cookie: lead, body: { ...gradeBody(), ...patch } })
      expect(r.status, field).toBe(422)
      expect(r.data.data.problems[0].field).toBe(field)
    }
    const dup = await call('/api/grades', { method: 'POST', cookie: lead, body: gradeBody('Fine casting (beta)') })
    expect(dup.status).toBe(409)
  })

  it('staff read grades; only a lead writes; a client reads nothing', async () => {
    expect((await call('/api/grades', { cookie: caster })).status).toBe(200)
    expect((await call('/api/grades', { method: 'POST', cookie: caster, body: gradeBody() })).status).toBe(403)
    expect((await call('/api/grades', { cookie: client })).status).toBe(403)
  })
})

describe('plaster lots', () => {
  it('shows stock on hand from pours that used the lot, and warns for low stock and old plaster', async () => {
    const lots = await call('/api/lots', { cookie: lead })
    expect(lots.status).toBe(200)
    const fine = lots.data.find((l: { lotCode: string }) => l.lotCode === 'FC-2611-A')
    // the demo has four demoulded pours from this lot (actual weights) and four planned ones (not yet used)
    const used = await testDb()('pours').join('plaster_lots', 'plaster_lots.id', 'pours.lot_id')
      .where('plaster_lots.lot_code', 'FC-2611-A').where('pours.state', 'demoulded').sum<{ sum: string }[]>('plaster_kg_actual as sum')
    expect(fine.stock.usedKg).toBeCloseTo(Number(used[0]!.sum), 6)
    expect(fine.stock.onHandKg).toBeCloseTo(40 * 25 - Number(used[0]!.sum), 6)
    expect(fine.stock.lowStock).toBe(false)
    const old = lots.data.find((l: { lotCode: string }) => l.lotCode === 'FC-2605-C')
    expect(old.stock.pastUseBy).toBe(true)
    expect(old.stock.warnings.join(' ')).toMatch(/use-by/)
  })

  it('receives a delivery, validates it, refuses a duplicate lot code and another workshop\'s grade', async () => {
    const grades = await call('/api/grades', { cookie: lead })
    const gradeId = grades.data[0].id
    const code = `LOT-${uid()}`
    const body = { gradeId, lotCode: code, bagsReceived: 1, bagKg: 25, receivedOn: '2026-11-30', useBy: '2027-05-30' }
    const r = await call('/api/lots', { method: 'POST', cookie: lead, body })
    expect(r.status).toBe(201)
    const listed = (await call('/api/lots', { cookie: lead })).data.find((l: { id: number }) => l.id === r.data.id)
    expect(listed.stock).toMatchObject({ onHandKg: 25, lowStock: true })
    expect((await call('/api/lots', { method: 'POST', cookie: lead, body })).status).toBe(409)
    for (const [patch, field] of [[{ bagsReceived: 0 }, 'bagsReceived'], [{ receivedOn: '30/11/2026' }, 'receivedOn'], [{ useBy: '2026-01-01' }, 'useBy'], [{ lotCode: '' }, 'lotCode']] as const) {
      const bad = await call('/api/lots', { method: 'POST', cookie: lead, body: { ...body, lotCode: `LOT-${uid()}`, ...patch } })
      expect(bad.status, field).toBe(422)
      expect(bad.data.data.problems[0].field).toBe(field)
    }
    const other = await makeOtherWorkshop()
    const [otherGrade] = await testDb()('plaster_grades').insert({ ...gradeRow(), workshop_id: other.workshopId }).returning('id')
    const foreign = await call('/api/lots', { method: 'POST', cookie: lead, body: { ...body, lotCode: `LOT-${uid()}`, gradeId: Number(otherGrade.id) } })
    expect(foreign.status).toBe(422)
    expect(foreign.data.data.problems[0].field).toBe('gradeId')
  })

  it('exports lots as CSV for a lead only', async () => {
    const r = await call('/api/lots/export', { cookie: lead })
    expect(r.status).toBe(200)
    expect(r.headers.get('content-type')).toMatch(/text\/csv/)
    expect(r.headers.get('content-disposition')).toMatch(/attachment; filename="setline-lots.csv"/)
    expect(String(r.data).split('\n')[0]).toBe('lot code,grade,bags received,bag (kg),received on,use by,on hand (kg),on hand (bags),warnings,archived,notes,price per bag')
    expect(String(r.data)).toMatch(/FC-2611-A,Fine casting \(beta\),40,25\.00,/)
    // stock on hand as the Lots page works it out (the same service), in the same row
    const page = (await call('/api/lots', { cookie: lead })).data as { lotCode: string; stock: { onHandKg: number; onHandBags: number } }[]
    const fc = page.find(l => l.lotCode === 'FC-2611-A')!
    const row = String(r.data).split('\n').find(line => line.startsWith('FC-2611-A,'))!
    expect(row).toContain(`,${fc.stock.onHandKg.toFixed(1)},${fc.stock.onHandBags},`)
    expect((await call('/api/lots/export', { cookie: caster })).status).toBe(403)
  })
})

function gradeRow() {
  const g = GRADE_PRESETS['beta-casting']
  return {
    name: `Foreign ${uid()}`, form: g.form, powder_density: g.powderDensity, consistency_min: 60, consistency_max: 80, consistency_default: 70,
    demould_minutes_ref: 30, set_time_water_exponent: 1.2, temperature_factors: JSON.stringify(g.temperatureFactors),
    hydration_heat: g.hydrationHeat, set_expansion_pct: 0.2, purity: 1,
  }
}

describe('benches', () => {
  it('a lead adds, reorders and archives a bench; names are unique; fields are validated', async () => {
    const name = `Bench ${uid()}`
    const r = await call('/api/benches', { method: 'POST', cookie: lead, body: { name, kind: 'run casting', lengthM: 4, sortOrder: 9 } })
    expect(r.status).toBe(201)
    const moved = await call(`/api/benches/${r.data.id}`, { method: 'PATCH', cookie: lead, body: { sortOrder: 0, version: 1 } })
    expect(moved.data).toMatchObject({ sortOrder: 0, lengthM: 4, archivedAt: null, version: 2 })
    expect((await call('/api/benches', { method: 'POST', cookie: lead, body: { name, kind: 'x', sortOrder: 1 } })).status).toBe(409)
    const bad = await call('/api/benches', { method: 'POST', cookie: lead, body: { name: 'B', kind: 'x', lengthM: -2, sortOrder: 1 } })
    expect(bad.data.data.problems[0].field).toBe('lengthM')
    const noVersion = await call(`/api/benches/${r.data.id}`, { method: 'PATCH', cookie: lead, body: { archived: true } })
    expect(noVersion.data.data.problems[0].field).toBe('version')
  })
})

describe('moulds', () => {
  it('a lead creates a mould; a duplicate code is a 409; each bad field is a 422 naming it', async () => {
    const body = mouldBody()
    const r = await call('/api/moulds', { method: 'POST', cookie: lead, body })
    expect(r.status).toBe(201)
    expect(r.data).toMatchObject({ code: body.code, state: 'ready', life: { nearEnd: false } })
    const dup = await call('/api/moulds', { method: 'POST', cookie: lead, body })
    expect(dup.status).toBe(409)
    expect(dup.data.message).toMatch(/A mould with this code already exists/)
    const cases: [string, unknown][] = [['code', ''], ['casts', ''], ['material', 'bronze'], ['cavityLitres', 0], ['castLengthM', 30],
      ['prepMinutes', 1.5], ['cleanMinutes', -1], ['maxDwellMinutes', 'long'], ['pulls', -3], ['expectedPulls', 0], ['benchId', 'x']]
    for (const [field, value] of cases) {
      const bad = await call('/api/moulds', { method: 'POST', cookie: lead, body: { ...mouldBody(), [field]: value } })
      expect(bad.status, field).toBe(422)
      expect(bad.data.data.problems[0].field).toBe(field)
    }
  })

  it('flags a mould at 90 % of its life, records state changes with who and why, and keeps its history', async () => {
    const r = await call('/api/moulds', { method: 'POST', cookie: lead, body: { ...mouldBody(), pulls: 90, expectedPulls: 100 } })
    expect(r.data.life).toMatchObject({ nearEnd: true, pastEnd: false })
    const noReason = await call(`/api/moulds/${r.data.id}/state`, { method: 'POST', cookie: lead, body: { state: 'repair', version: 1 } })
    expect(noReason.status).toBe(422)
    expect(noReason.data.data.problems[0].field).toBe('reason')
    const repair = await call(`/api/moulds/${r.data.id}/state`, { method: 'POST', cookie: lead, body: { state: 'repair', reason: 'Torn flange', version: 1 } })
    expect(repair.status).toBe(200)
    expect(repair.data).toMatchObject({ state: 'repair', stateReason: 'Torn flange', version: 2 })
    const detail = await call(`/api/moulds/${r.data.id}`, { cookie: caster })
    expect(detail.status).toBe(200)
    expect(detail.data.stateChangedByName).toBe(demo.lead.name)
    expect(detail.data.events[0]).toMatchObject({ type: 'mould.state_changed', actor: demo.lead.name, data: { from: 'ready', to: 'repair', reason: 'Torn flange' } })
    const stale = await call(`/api/moulds/${r.data.id}/state`, { method: 'POST', cookie: lead, body: { state: 'ready', version: 1 } })
    expect(stale.status).toBe(409)
    const demoMould = (await call('/api/moulds', { cookie: lead })).data.find((m: { code: string }) => m.code === 'CR-101')
    const history = await call(`/api/moulds/${demoMould.id}`, { cookie: lead })
    expect(history.data.pours.length).toBeGreaterThanOrEqual(7)
    expect(history.data.pours[0]).toHaveProperty('jobCode', 'J-2601')
  })

  it('edits a mould with its version, refuses a code taken by another mould, exports CSV', async () => {
    const a = await call('/api/moulds', { method: 'POST', cookie: lead, body: mouldBody() })
    const edited = await call(`/api/moulds/${a.data.id}`, { method: 'PATCH', cookie: lead, body: { casts: 'Renamed', version: 1 } })
    expect(edited.data).toMatchObject({ casts: 'Renamed', version: 2 })
    const taken = await call(`/api/moulds/${a.data.id}`, { method: 'PATCH', cookie: lead, body: { code: 'CR-101', version: 2 } })
    expect(taken.status).toBe(409)
    const csv = await call('/api/moulds/export', { cookie: lead })
    expect(csv.headers.get('content-type')).toMatch(/text\/csv/)
    expect(String(csv.data)).toMatch(/^code,casts,material,bench/)
    // the words the page shows, not the stored codes; figures in the workshop's units (metric here)
    expect(String(csv.data).split('\n')[0]).toContain('cavity (L),cast length (m)')
    expect(String(csv.data)).toMatch(/PM-33,.*,Plaster piece mould,Small-work bench,0\.800,0\.900,20,15,45,55,80,Repair/)
    expect(String(csv.data)).not.toMatch(/,(plaster_piece|grp_case|in_use),/)
  })

  it('keeps workshops apart', async () => {
    const other = await makeOtherWorkshop()
    const otherLead = await signIn(other.lead.email, DEMO_PASSWORD)
    expect((await call('/api/moulds', { cookie: otherLead })).data).toEqual([])
    expect((await call('/api/lots', { cookie: otherLead })).data).toEqual([])
    const demoMould = (await call('/api/moulds', { cookie: lead })).data[0]
    expect((await call(`/api/moulds/${demoMould.id}`, { cookie: otherLead })).status).toBe(404)
    expect((await call(`/api/moulds/${demoMould.id}`, { method: 'PATCH', cookie: otherLead, body: { casts: 'x', version: demoMould.version } })).status).toBe(404)
    expect((await call(`/api/moulds/${demoMould.id}/state`, { method: 'POST', cookie: otherLead, body: { state: 'cleaning', version: demoMould.version } })).status).toBe(404)
    const bench = (await call('/api/benches', { cookie: lead })).data[0]
    const foreignBench = await call('/api/moulds', { method: 'POST', cookie: otherLead, body: { ...mouldBody(), benchId: bench.id } })
    expect(foreignBench.status).toBe(422)
    expect(foreignBench.data.data.problems[0].field).toBe('benchId')
    expect(await demoWorkshopId()).not.toBe(other.workshopId)
  })
})
