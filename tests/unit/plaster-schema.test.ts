import { describe, it, expect } from 'vitest'
import { mixInputSchema, plasterGradeSchema, type MixInput } from '#shared/utils/plaster-schema'
import { GRADE_PRESETS, mixSummary, type PlasterMixInput } from '#shared/utils/plaster'

const beta = GRADE_PRESETS['beta-casting']
const valid = {
  cavityLitres: 1,
  grade: beta,
  consistency: 70,
  wastePct: 10,
  waterTempC: 20,
  powderTempC: 20,
  shopTempC: 20,
  setFactor: 1,
  maxDwellMinutes: 60,
}

function firstIssue(input: unknown) {
  const r = mixInputSchema.safeParse(input)
  expect(r.success).toBe(false)
  return r.error!.issues[0]!
}

describe('mixInputSchema', () => {
  it('accepts a valid mix and its output feeds mixSummary', () => {
    const parsed: MixInput = mixInputSchema.parse(valid)
    const typed: PlasterMixInput = parsed // the inferred type matches mixSummary's input
    expect(mixSummary(typed).batch.slurryLitres).toBeCloseTo(1.1, 12)
    expect(parsed.grade).not.toHaveProperty('label') // the display label is not part of a grade
  })

  it('defaults wastePct to 0 and setFactor to 1', () => {
    const { wastePct: _w, setFactor: _s, ...rest } = valid
    const parsed = mixInputSchema.parse(rest)
    expect(parsed.wastePct).toBe(0)
    expect(parsed.setFactor).toBe(1)
  })

  it('names the field and the range in its messages', () => {
    const low = firstIssue({ ...valid, consistency: 18 })
    expect(low.path).toEqual(['consistency'])
    expect(low.message).toBe('consistency must be between 18.6 and 200 (parts water per 100 parts plaster)')
    expect(firstIssue({ ...valid, cavityLitres: 0 }).message).toMatch(/^cavityLitres must be greater than 0/)
    expect(firstIssue({ ...valid, cavityLitres: Number.NaN }).path).toEqual(['cavityLitres'])
    expect(firstIssue({ ...valid, shopTempC: 'warm' }).message).toMatch(/^shopTempC/)
    expect(firstIssue({ ...valid, grade: { ...beta, purity: 2 } }).path).toEqual(['grade', 'purity'])
  })

  it('applies the model\'s cross-field grade checks', () => {
    const badDefault = firstIssue({ ...valid, grade: { ...beta, consistency: { min: 60, max: 80, default: 85 } } })
    expect(badDefault.path).toEqual(['grade', 'consistency', 'default'])
    const notOne = firstIssue({ ...valid, grade: { ...beta, temperatureFactors: [[10, 1.2], [30, 1.1]] } })
    expect(notOne.path).toEqual(['grade', 'temperatureFactors'])
    expect(notOne.message).toMatch(/1 at 20 °C/)
    const unsorted = firstIssue({ ...valid, grade: { ...beta, temperatureFactors: [[20, 1], [20, 1]] } })
    expect(unsorted.path).toEqual(['grade', 'temperatureFactors', 1, 0])
  })
})

describe('plasterGradeSchema', () => {
  it('accepts every preset and rejects a bad form', () => {
    for (const g of Object.values(GRADE_PRESETS)) expect(plasterGradeSchema.safeParse(g).success).toBe(true)
    const r = plasterGradeSchema.safeParse({ ...beta, form: 'gamma' })
    expect(r.success).toBe(false)
    expect(r.error!.issues[0]!.message).toMatch(/^grade\.form/)
  })
})
