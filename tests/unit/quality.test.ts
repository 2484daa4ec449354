import { describe, expect, it } from 'vitest'
import { NOT_RECORDED, qualityFigures, temperatureBand, type QualityPour } from '#shared/utils/quality'
import { notifyPrefsOf, notifyPrefsPatchSchema } from '#shared/utils/notify-schemas'

const at = (min: number) => new Date(Date.UTC(2027, 0, 4, 9) + min * 60_000)
function pour(over: Partial<QualityPour> = {}): QualityPour {
  // predicted 35 min from the start of mixing at set factor 1: 5 of mixing, 30 of set
  return {
    mould: 'CR-1', grade: 'Beta', caster: 'Idris', shopTempC: 18, result: 'sound', mixingAt: at(0), demouldOpenAt: at(35),
    demouldCloseAt: at(275), demouldedAt: at(41), predictedMinutes: 35, ...over,
  }
}

describe('temperatureBand', () => {
  it('puts each bound in the band above it and an unknown temperature apart', () => {
    expect([9.99, 10, 14.9, 15, 20, 24.99, 25, 40].map(temperatureBand))
      .toEqual(['< 10 °C', '10–15 °C', '10–15 °C', '15–20 °C', '20–25 °C', '20–25 °C', '≥ 25 °C', '≥ 25 °C'])
    expect(temperatureBand(null)).toBe(NOT_RECORDED)
    expect(temperatureBand(Number.NaN)).toBe(NOT_RECORDED)
  })
})

describe('qualityFigures', () => {
  it('counts pours and defects per mould, grade, caster and band', () => {
    const f = qualityFigures([
      pour(), pour({ result: 'defect' }), pour({ mould: 'AB-2', caster: null, result: 'defect', shopTempC: 8 }),
      pour({ grade: 'Alpha', shopTempC: 26 }),
    ])
    expect(f).toMatchObject({ pours: 4, defects: 2 })
    expect(f.byMould).toEqual([{ key: 'AB-2', pours: 1, defects: 1, rate: 1 }, { key: 'CR-1', pours: 3, defects: 1, rate: 1 / 3 }])
    expect(f.byGrade.map(r => [r.key, r.pours, r.defects])).toEqual([['Alpha', 1, 0], ['Beta', 3, 2]])
    expect(f.byCaster.map(r => r.key)).toEqual(['Idris', 'no caster'])
    // bands in temperature order, not alphabetical; empty bands left out
    expect(f.byTemperature.map(r => [r.key, r.pours])).toEqual([['< 10 °C', 1], ['15–20 °C', 2], ['≥ 25 °C', 1]])
  })

  it('calibrates per grade with the register\'s rule: set part only, attended demoulds only', () => {
    // set part predicted 30 min each; demoulded 41, 50 and 35 min after mixing began → set 36, 45, 30
    // → ratios 1.2, 1.5, 1.0 → median 1.2. Left out: no demould, early (34 < 35) and next morning.
    const f = qualityFigures([
      pour(), pour({ demouldedAt: at(50) }), pour({ demouldedAt: at(35) }), pour({ demouldedAt: null }),
      pour({ demouldedAt: at(34) }), pour({ demouldedAt: at(16 * 60) }),
    ])
    expect(f.calibration).toEqual([{ grade: 'Beta', count: 3, excluded: 3, factor: 1.2, predictedMinutes: 30, actualMinutes: 36 }])
  })

  it('leaves out samples without a mixing time or a stored prediction; no sample gives factor 1', () => {
    const f = qualityFigures([pour({ mixingAt: null }), pour({ predictedMinutes: null })])
    expect(f.calibration).toEqual([{ grade: 'Beta', count: 0, excluded: 2, factor: 1, predictedMinutes: null, actualMinutes: null }])
    expect(qualityFigures([])).toMatchObject({ pours: 0, byMould: [], calibration: [] })
  })
})

describe('notification preferences', () => {
  it('treats every kind as on unless stored as false', () => {
    expect(notifyPrefsOf({ photos_shared: false, stale: false })).toEqual({ sample_ready: true, photos_shared: false, job_ready: true, quote_sent: true, sample_decision: true, demould_overdue: true, quote_decision: true, delivery: true, invoice: true })
    expect(notifyPrefsOf(null).job_ready).toBe(true)
  })
  it('accepts known kinds with boolean flags only', () => {
    expect(notifyPrefsPatchSchema.safeParse({ job_ready: false }).success).toBe(true)
    expect(notifyPrefsPatchSchema.safeParse({ job_ready: 'no' }).error?.issues[0]?.path).toEqual(['job_ready'])
    expect(notifyPrefsPatchSchema.safeParse({ unknown: true }).success).toBe(false)
  })
})
