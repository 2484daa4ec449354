// A lead applies a grade's demould calibration: the live factor the register keeps is copied,
// and from then on new pours on the board and the mix card start from it and say so.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { call, signIn } from '../setup/http'
import { DEMO_PASSWORD, closeTestDb, demo, demoWorkshopId, testDb } from '../setup/fixtures'

let lead = ''
let caster = ''
let gradeId = 0
const uid = () => Math.random().toString(36).slice(2, 8).toUpperCase()

beforeAll(async () => {
  lead = await signIn(demo.lead.email, DEMO_PASSWORD)
  caster = await signIn(demo.caster1.email, DEMO_PASSWORD)
  const grades = (await call('/api/grades', { cookie: lead })).data as { id: number; name: string }[]
  gradeId = grades.find(g => g.name === 'Fine casting (beta)')!.id
})
afterAll(closeTestDb)

const version = async () => ((await call('/api/grades', { cookie: lead })).data as { id: number; version: number }[]).find(g => g.id === gradeId)!.version
const apply = (cookie: string, body: unknown) => call(`/api/grades/${gradeId}/calibration`, { method: 'POST', cookie, body })

describe('applying a grade calibration', () => {
  it('refuses to apply before any attended demould, naming the field', async () => {
    const ws = await demoWorkshopId()
    await testDb()('plaster_grades').where({ workshop_id: ws, id: gradeId }).update({ calibration_factor: null, calibration_count: 0 })
    const r = await apply(lead, { apply: true, version: await version() })
    expect(r.status).toBe(422)
    expect(JSON.stringify(r.data)).toMatch(/Apply/)
  })

  it('copies the live factor; new pours and the mix card use it and say so; withdrawing goes back to 1', async () => {
    const ws = await demoWorkshopId()
    // the register's live calibration, as demoulds would have left it
    await testDb()('plaster_grades').where({ workshop_id: ws, id: gradeId }).update({ calibration_factor: 1.3, calibration_count: 12, calibration_excluded: 5 })
    expect((await apply(caster, { apply: true, version: await version() })).status).toBe(403)
    const v = await version()
    const r = await apply(lead, { apply: true, version: v })
    expect(r.status).toBe(200)
    expect(r.data.calibration).toEqual({ factor: 1.3, count: 12, excluded: 5, applied: true, appliedFactor: 1.3, appliedCount: 12 })
    expect(r.data.version).toBe(v + 1)
    expect((await apply(lead, { apply: true, version: v })).status).toBe(409) // stale version

    // a later demould moves the live factor, not the applied one
    await testDb()('plaster_grades').where({ workshop_id: ws, id: gradeId }).update({ calibration_factor: 1.5, calibration_count: 13 })
    const options = (await call('/api/calc/options', { cookie: caster })).data as { grades: { id: number; calibration: { appliedFactor: number; factor: number } }[] }
    expect(options.grades.find(g => g.id === gradeId)!.calibration).toMatchObject({ factor: 1.5, appliedFactor: 1.3 })

    const mould = await call('/api/moulds', { method: 'POST', cookie: lead, body: { code: `CAL-${uid()}`, casts: 'Calibration test rose', material: 'silicone', cavityLitres: 2, prepMinutes: 10, cleanMinutes: 10, maxDwellMinutes: 120, pulls: 0, expectedPulls: 100 } })
    expect(mould.status).toBe(201)
    const pour = await call('/api/pours', { method: 'POST', cookie: lead, body: { mouldId: mould.data.id, gradeId, slotStart: '2027-10-12T08:00:00Z' } })
    expect(pour.status).toBe(201)
    expect(pour.data.setFactor).toBe(1.3)
    const bare = await call('/api/pours', { method: 'POST', cookie: lead, body: { mouldId: mould.data.id, gradeId, setFactor: 1, slotStart: '2027-10-13T08:00:00Z' } })
    // the calibrated window opens later than the bare model's by 0.3 × the set part
    const open = (p: { mixAt: string; demouldOpenAt: string }) => (Date.parse(p.demouldOpenAt) - Date.parse(p.mixAt)) / 60_000
    expect(open(pour.data)).toBeGreaterThan(open(bare.data))

    const withdrawn = await apply(lead, { apply: false, version: await version() })
    expect(withdrawn.data.calibration).toMatchObject({ applied: false, appliedFactor: null, appliedCount: 0 })
    const after = await call('/api/pours', { method: 'POST', cookie: lead, body: { mouldId: mould.data.id, gradeId, slotStart: '2027-10-14T08:00:00Z' } })
    expect(after.data.setFactor).toBe(1)
  })
})
