// Finishing's pure rules: the cast's estimated drying area, the dry-by time, the weight a piece
// is lifted at, and the action and dispatch schemas (fields named when wrong, order of states).
import { describe, expect, it } from 'vitest'
import { PlasterInputError, castExposedAreaM2, dryingEstimate } from '#shared/utils/plaster'
import { FINISHING_TEAM_LIFT_KG, finishingDryBy, finishingFallingRate, finishingHandlingKg } from '#shared/utils/finishing'
import { finishingActionSchema, finishingDispatchSchema } from '#shared/utils/finishing-schemas'
import { FINISHING_STEPS } from '#shared/utils/finishing-steps'

const id = '0b7f6f0e-2f5b-4c1e-9a7e-5d2f3c4b1a09'
const fields = (schema: typeof finishingActionSchema | typeof finishingDispatchSchema, v: unknown) => {
  const r = schema.safeParse(v)
  return r.success ? [] : r.error.issues.map(i => i.path.join('.'))
}

describe('castExposedAreaM2', () => {
  it('takes both faces of a 25 mm shell: 2 L → 0.16 m² (2 × 0.002 m³ / 0.025 m)', () => {
    expect(castExposedAreaM2({ volumeLitres: 2 })).toBeCloseTo(0.16, 10)
    expect(castExposedAreaM2({ volumeLitres: 2, thicknessMm: 50 })).toBeCloseTo(0.08, 10)
  })

  it('throws a named error for a volume or section out of range', () => {
    expect(() => castExposedAreaM2({ volumeLitres: 0 })).toThrow(PlasterInputError)
    expect(() => castExposedAreaM2({ volumeLitres: 1, thicknessMm: -1 })).toThrow(/thicknessMm/)
  })
})

describe('finishingDryBy', () => {
  it('is the drying estimate over the cast\'s area, counted from when it went to dry', () => {
    const from = new Date('2031-03-03T10:00:00Z')
    const r = finishingDryBy({ from, wetMassKg: 3.2, dryMassKg: 2.2, cavityLitres: 2, airTempC: 20, relHumidityPct: 50 })
    // Carrier's equation by hand at 20 °C, 50 % RH, 0.3 m/s over 0.16 m²: wet bulb 13.70 °C
    // (Stull 2011), p_s 1.5675 kPa, p_a 0.5 × 2.3383 kPa (Buck), Y = 2468.66 kJ/kg:
    // 0.16 × 0.3983 × (0.089 + 0.02346) / 2468.66 × 3600 = 0.010452 kg/h; 1 kg × 2 / that = 191.35 h
    expect(r.hours).toBeCloseTo(191.35, 1)
    expect(r.hours).toBe(dryingEstimate({ freeWaterKg: 1, exposedAreaM2: 0.16, airTempC: 20, relHumidityPct: 50, airSpeedMs: 0.3 }).hours)
    expect(Math.abs(r.dryBy!.getTime() - (from.getTime() + r.hours * 3_600_000))).toBeLessThan(1)
    expect(r.warnings).toEqual([])
  })

  it('dries sooner in a warmer, drier room and never in saturated air', () => {
    const base = { from: new Date(), wetMassKg: 3, dryMassKg: 2, cavityLitres: 2 }
    expect(finishingDryBy({ ...base, airTempC: 35, relHumidityPct: 30 }).hours).toBeLessThan(finishingDryBy({ ...base, airTempC: 20, relHumidityPct: 50 }).hours)
    const wet = finishingDryBy({ ...base, airTempC: 20, relHumidityPct: 100 })
    expect(wet.dryBy).toBeNull()
    expect(wet.warnings.join(' ')).toMatch(/saturated/)
  })
})

describe('finishingFallingRate', () => {
  const h = (hours: number) => new Date(Date.UTC(2027, 2, 1, 8) + hours * 3_600_000)
  /** A spell put to dry at 0 h, weighed at `first` h and again 24 h later at the same weight. */
  const spell = (estimatedHours: number | null, first: number) => ({ fettledAt: h(0), estimatedHours, weighings: [{ kg: 5, at: h(first) }, { kg: 5, at: h(first + 24) }] })

  it('fits the shop\'s factor from the hours to constant weight over the estimate, once 5 pieces stand behind it', () => {
    // invented: estimates of 20 h, constant weight first shown at 30, 36, 40, 44 and 50 h: ratios 1.5, 1.8, 2.0, 2.2, 2.5
    const five = [30, 36, 40, 44, 50].map(t => spell(20, t))
    expect(finishingFallingRate(five)).toMatchObject({ factor: expect.closeTo(2.0, 9), count: 5, source: 'shop' })
    // four are not enough: the default, said so
    expect(finishingFallingRate(five.slice(0, 4))).toMatchObject({ factor: 1, count: 4, source: 'default', note: expect.stringMatching(/4 of 5/) })
  })

  it('leaves out spells that never reached constant weight or had no estimate (saturated air)', () => {
    const still = { fettledAt: h(0), estimatedHours: 20, weighings: [{ kg: 5.5, at: h(30) }, { kg: 5, at: h(60) }] }
    const five = [30, 36, 40, 44, 50].map(t => spell(20, t))
    expect(finishingFallingRate([...five.slice(0, 4), still, spell(null, 40)])).toMatchObject({ count: 4, source: 'default' })
    expect(finishingFallingRate([...five, still])).toMatchObject({ factor: expect.closeTo(2.0, 9), count: 5 })
  })
})

describe('finishingHandlingKg', () => {
  it('lifts at the last weighing, else wet while it may hold water, dry once passed', () => {
    const p = { wetMassKg: 30, dryMassKg: 22, lastWeighedKg: null }
    expect(finishingHandlingKg({ ...p, state: 'to_fettle' })).toBe(30)
    expect(finishingHandlingKg({ ...p, state: 'drying' })).toBe(30)
    expect(finishingHandlingKg({ ...p, state: 'packed' })).toBe(22)
    expect(finishingHandlingKg({ ...p, state: 'drying', lastWeighedKg: 24.5 })).toBe(24.5)
    expect(FINISHING_TEAM_LIFT_KG).toBe(25) // HSE INDG143, close to the body at waist height
  })
})

describe('finishingActionSchema', () => {
  it('accepts each kind with its own data', () => {
    for (const body of [
      { kind: 'fettled' }, { kind: 'fettled', dryingTempC: 30, dryingHumidityPct: 40 }, { kind: 'weighed', weighedKg: 2.3 },
      { kind: 'ready' }, { kind: 'ready', override: true }, { kind: 'repair', reason: 'crack: along the fillet' },
      { kind: 'repaired' }, { kind: 'rejected', reason: 'warped' }, { kind: 'packed', at: '2031-03-03T10:00:00Z' },
    ]) expect(fields(finishingActionSchema, { actionId: id, version: 1, ...body }), JSON.stringify(body)).toEqual([])
  })

  it('names the bad field; refuses a drying room above 49 °C', () => {
    expect(fields(finishingActionSchema, { actionId: id, version: 1, kind: 'fettled', dryingTempC: 55 })).toEqual(['dryingTempC'])
    expect(finishingActionSchema.safeParse({ actionId: id, version: 1, kind: 'fettled', dryingTempC: 55 }).error!.issues[0]!.message).toMatch(/49 °C/)
    expect(fields(finishingActionSchema, { actionId: id, version: 1, kind: 'weighed', weighedKg: 0 })).toEqual(['weighedKg'])
    expect(fields(finishingActionSchema, { actionId: id, version: 1, kind: 'repair', reason: ' ' })).toEqual(['reason'])
    expect(fields(finishingActionSchema, { actionId: id, version: 0, kind: 'packed' })).toEqual(['version'])
    expect(fields(finishingActionSchema, { actionId: id, version: 1, kind: 'dispatched' })).toEqual(['kind'])
  })

  it('orders the states to fettle → drying → ready → packed, with repair and reject beside', () => {
    expect([FINISHING_STEPS.fettled, FINISHING_STEPS.ready, FINISHING_STEPS.packed].map(s => `${s.from.join('|')}>${s.to}`))
      .toEqual(['to_fettle>drying', 'drying>ready', 'ready>packed'])
    expect(FINISHING_STEPS.rejected.from).not.toContain('ready')
    expect(FINISHING_STEPS.repaired).toEqual({ from: ['repair'], to: 'to_fettle' })
  })
})

describe('finishingDispatchSchema', () => {
  it('needs at least one piece, each once', () => {
    expect(fields(finishingDispatchSchema, { actionId: id, pieceIds: [3, 4] })).toEqual([])
    expect(fields(finishingDispatchSchema, { actionId: id, pieceIds: [] })).toEqual(['pieceIds'])
    expect(fields(finishingDispatchSchema, { actionId: id, pieceIds: [3, 3] })).toEqual(['pieceIds'])
    expect(fields(finishingDispatchSchema, { actionId: id, pieceIds: [3], notes: 'x'.repeat(501) })).toEqual(['notes'])
  })
})
