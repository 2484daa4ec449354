// POST /api/calc/mix and GET /api/calc/options: the mix card's numbers for other tools.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { call, signIn } from '../setup/http'
import { DEMO_PASSWORD, closeTestDb, demo, makeOtherWorkshop, testDb } from '../setup/fixtures'
import { GRADE_PRESETS, mixSummary } from '#shared/utils/plaster'

let lead = ''
let client = ''
afterAll(closeTestDb)
beforeAll(async () => {
  lead = await signIn(demo.lead.email, DEMO_PASSWORD)
  client = await signIn(demo.client1.email, DEMO_PASSWORD)
})

const mix = { consistency: 70, wastePct: 0, waterTempC: 20, powderTempC: 20, shopTempC: 20, setFactor: 1 }

describe('POST /api/calc/mix', () => {
  it('returns the plaster model\'s numbers for a whole grade and a cavity', async () => {
    const r = await call('/api/calc/mix', { method: 'POST', cookie: client, body: { ...mix, grade: GRADE_PRESETS['beta-casting'], cavityLitres: 1, maxDwellMinutes: 60 } })
    expect(r.status).toBe(200)
    // Derived check value: 1.000 L, beta 2.63 g/cm³ at consistency 70, no waste →
    // 1 / (1/2.63 + 0.70) = 0.9257 kg plaster, × 0.70 = 0.6480 kg water, slurry 1.574 kg/L,
    // cast 0.9257 × 1.18618 = 1.098 kg dry
    expect(r.data.batch.plasterKg).toBeCloseTo(0.9257, 4)
    expect(r.data.batch.waterKg).toBeCloseTo(0.6480, 4)
    expect(r.data.batch.slurryDensity).toBeCloseTo(1.574, 3)
    expect(r.data.cast.dryMassKg).toBeCloseTo(1.098, 3)
    expect(r.data.window.closeMinutes - r.data.window.openMinutes).toBeCloseTo(60, 6)
    expect(r.data.setCurve.length).toBeGreaterThan(5)
  })

  it('takes the grade and the mould of the workshop by id', async () => {
    const k = testDb()
    const grade = await k('plaster_grades').join('users', 'users.workshop_id', 'plaster_grades.workshop_id')
      .where('users.email', demo.lead.email).where('plaster_grades.preset_key', 'beta-casting').first('plaster_grades.id')
    const mould = await k('moulds').where({ code: 'CR-101' }).first('id', 'cavity_litres', 'max_dwell_minutes')
    const r = await call('/api/calc/mix', { method: 'POST', cookie: lead, body: { ...mix, gradeId: Number(grade.id), mouldId: Number(mould.id) } })
    expect(r.status).toBe(200)
    const expected = mixSummary({ ...mix, grade: GRADE_PRESETS['beta-casting'], cavityLitres: Number(mould.cavity_litres), maxDwellMinutes: mould.max_dwell_minutes })
    expect(r.data.batch.plasterKg).toBeCloseTo(expected.batch.plasterKg, 6)
    expect(r.data.window.openMinutes).toBeCloseTo(expected.window.openMinutes, 6)
  })

  it('names the bad field with 422', async () => {
    const cases: [Record<string, unknown>, string][] = [
      [{ ...mix, cavityLitres: 1 }, 'gradeId'],
      [{ ...mix, grade: GRADE_PRESETS['beta-casting'] }, 'cavityLitres'],
      [{ ...mix, consistency: 12, grade: GRADE_PRESETS['beta-casting'], cavityLitres: 1 }, 'consistency'],
      [{ ...mix, waterTempC: 'warm', grade: GRADE_PRESETS['beta-casting'], cavityLitres: 1 }, 'waterTempC'],
      [{ ...mix, cavityLitres: -1, grade: GRADE_PRESETS['beta-casting'] }, 'cavityLitres'],
      [{ ...mix, cavityLitres: 1, grade: { ...GRADE_PRESETS['beta-casting'], purity: 2 } }, 'grade.purity'],
    ]
    for (const [body, field] of cases) {
      const r = await call('/api/calc/mix', { method: 'POST', cookie: lead, body })
      expect(r.status, field).toBe(422)
      expect(r.data.data.problems[0].field, JSON.stringify(r.data)).toBe(field)
    }
  })

  it('refuses another workshop\'s grade or mould as unknown', async () => {
    const other = await makeOtherWorkshop()
    const otherLead = await signIn(other.lead.email, DEMO_PASSWORD)
    const grade = await testDb()('plaster_grades').where({ preset_key: 'beta-casting' }).first('id')
    const r = await call('/api/calc/mix', { method: 'POST', cookie: otherLead, body: { ...mix, gradeId: Number(grade.id), cavityLitres: 1 } })
    expect(r.status).toBe(422)
    expect(r.data.data.problems[0]).toEqual({ field: 'gradeId', message: 'Plaster grade is not one of this workshop\'s grades' })
  })
})

describe('GET /api/calc/options', () => {
  it('lists the workshop\'s grades as the model wants them, its moulds and units', async () => {
    const r = await call('/api/calc/options', { cookie: lead })
    expect(r.status).toBe(200)
    expect(r.data.units).toBe('metric')
    const fine = r.data.grades.find((g: { name: string }) => g.name === 'Fine casting (beta)')
    const { label: _label, hydrationHeat, ...preset } = GRADE_PRESETS['beta-casting']
    expect(fine.grade).toMatchObject(preset)
    // stored as numeric(7,2): Southard's 132.604 J/g keeps two decimals
    expect(fine.grade.hydrationHeat).toBeCloseTo(hydrationHeat, 2)
    expect(r.data.moulds.map((m: { code: string }) => m.code)).toContain('CR-101')
  })
})
