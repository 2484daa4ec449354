import { describe, it, expect } from 'vitest'
import {
  PlasterInputError,
  dryingEstimate,
  dryingGuard,
  constantWeight,
  constantWeightReachedAt,
  dryMassGuide,
  dryness,
  fallingRateFromWeighings,
  fallingRateNote,
  fToC,
  saturationVapourPressureKPa,
  wetBulbC,
} from '#shared/utils/plaster'
import { inputErrorField } from '../setup/input-errors'

function expectNear(actual: number, expected: number, relTol: number) {
  expect(Math.abs(actual / expected - 1)).toBeLessThan(relTol)
}

const fieldOf = (fn: () => unknown) => inputErrorField(fn, PlasterInputError)

describe('saturationVapourPressureKPa (Buck 1996)', () => {
  it('matches the IAPWS-95 table values within 0.1 %', () => {
    // IAPWS-95 as tabulated in the CRC Handbook, recalled from memory (editions differ by < 0.02 %)
    expectNear(saturationVapourPressureKPa(0), 0.61121, 0.001)
    expectNear(saturationVapourPressureKPa(10), 1.2282, 0.001)
    expectNear(saturationVapourPressureKPa(20), 2.3392, 0.001) // IAPWS / CRC Handbook tables: 2.339 kPa, within 0.1 %
    expectNear(saturationVapourPressureKPa(30), 4.2467, 0.001)
    expectNear(saturationVapourPressureKPa(40), 7.3844, 0.001)
    expectNear(saturationVapourPressureKPa(50), 12.352, 0.001)
  })

  it('gives Buck\'s own constant at 0 °C', () => {
    expect(saturationVapourPressureKPa(0)).toBe(0.61121) // Buck 1996 manual (and 1981 paper): e(0 °C) = 6.1121 hPa
  })

  it('throws a named error outside −40–100 °C', () => {
    expect(fieldOf(() => saturationVapourPressureKPa(120))).toBe('tempC')
    expect(fieldOf(() => saturationVapourPressureKPa(Number.NaN))).toBe('tempC')
  })
})

describe('wetBulbC (Stull 2011)', () => {
  it('gives 13.7 °C at 20 °C and 50 % RH, the paper\'s own example', () => {
    expect(wetBulbC(20, 50)).toBeCloseTo(13.7, 1) // Stull 2011, J. Appl. Meteor. Climatol. 50: 2267
  })

  it('equals the air temperature in saturated air and never exceeds it', () => {
    expect(wetBulbC(20, 100)).toBe(20) // saturated air: wet bulb = dry bulb (definition)
    expect(wetBulbC(-20, 99)).toBeLessThanOrEqual(-20)
    expect(wetBulbC(20, 99.5)).toBeGreaterThan(wetBulbC(20, 99))
    expect(wetBulbC(20, 99.5)).toBeLessThan(20)
  })

  it('takes RH below 5 % at 5 % (the edge of Stull\'s fit)', () => {
    expect(wetBulbC(10, 0)).toBe(wetBulbC(10, 5))
  })

  it('throws a named error outside 0–100 % RH and −20–50 °C', () => {
    expect(fieldOf(() => wetBulbC(20, 101))).toBe('relHumidityPct')
    expect(fieldOf(() => wetBulbC(20, -1))).toBe('relHumidityPct')
    expect(fieldOf(() => wetBulbC(55, 50))).toBe('tempC')
    expect(fieldOf(() => wetBulbC(-25, 50))).toBe('tempC')
  })
})

describe('dryingEstimate (Carrier\'s equation, ASHRAE Handbook)', () => {
  it('matches Carrier\'s equation worked by hand', () => {
    // 1 m², air 20 °C / 50 % RH, 0.5 m/s:
    //   surface at the wet bulb 13.70 °C (Stull 2011)
    //   p_s = Buck(13.70) = 0.61121 × exp((18.678 − 0.05842) × 13.70 / 270.84) = 1.5675 kPa
    //   p_a = 0.5 × Buck(20) = 0.5 × 2.3383 = 1.1692 kPa; Δp = 0.3983 kPa
    //   Y = 2501 − 2.361 × 13.70 = 2468.7 kJ/kg
    //   rate = 1 × 0.3983 × (0.089 + 0.0782 × 0.5) / 2468.7 × 0.5 (activity factor, still unoccupied
    //          water, ASHRAE Handbook—HVAC Applications) = 0.3983 × 0.1281 / 2468.7 × 0.5
    //        = 1.0335e-5 kg/s = 0.0372 kg/h
    //   hours = 0.4757 kg (the 1 L beta cast's free water) / 0.0372 × 1 = 12.79 h
    const d = dryingEstimate({ freeWaterKg: 0.4757, exposedAreaM2: 1, airTempC: 20, relHumidityPct: 50, airSpeedMs: 0.5 })
    expect(d.wetBulbC).toBeCloseTo(13.7, 1)
    expect(d.constantRateKgPerHour).toBeCloseTo(0.0372, 4)
    expect(d.hours).toBeCloseTo(12.79, 1)
    expect(d.warnings).toEqual([])
  })

  it('scales with area and the falling-rate factor, and dries faster in moving air', () => {
    const base = { freeWaterKg: 1, exposedAreaM2: 1, airTempC: 25, relHumidityPct: 40, airSpeedMs: 1 }
    const one = dryingEstimate(base)
    expect(dryingEstimate({ ...base, exposedAreaM2: 2 }).hours).toBeCloseTo(one.hours / 2, 10)
    expect(dryingEstimate({ ...base, fallingRateFactor: 4 }).hours).toBeCloseTo(one.hours * 4, 10)
    expect(dryingEstimate({ ...base, airSpeedMs: 3 }).hours).toBeLessThan(one.hours)
    expect(dryingEstimate({ ...base, relHumidityPct: 70 }).hours).toBeGreaterThan(one.hours)
    expect(dryingEstimate({ ...base, freeWaterKg: 0 }).hours).toBe(0)
  })

  it('never finishes in saturated air and says so', () => {
    const d = dryingEstimate({ freeWaterKg: 1, exposedAreaM2: 1, airTempC: 20, relHumidityPct: 100, airSpeedMs: 1 })
    expect(d.constantRateKgPerHour).toBe(0)
    expect(d.hours).toBe(Infinity)
    expect(d.warnings.join(' ')).toMatch(/will not dry in these conditions/)
  })

  it('at 99.9 % RH says the cast will not dry instead of giving a date years away', () => {
    const d = dryingEstimate({ freeWaterKg: 1, exposedAreaM2: 1, airTempC: 20, relHumidityPct: 99.9, airSpeedMs: 1 })
    expect(d.hours).toBe(Infinity)
    expect(d.warnings.join(' ')).toMatch(/will not dry in these conditions/)
    expect(Number.isFinite(dryingEstimate({ freeWaterKg: 1, exposedAreaM2: 1, airTempC: 20, relHumidityPct: 99.8, airSpeedMs: 1 }).hours)).toBe(true)
  })

  it('warns below about 5 °C that a wet cast can freeze', () => {
    const cold = { freeWaterKg: 1, exposedAreaM2: 1, relHumidityPct: 60, airSpeedMs: 1 }
    expect(dryingEstimate({ ...cold, airTempC: 4 }).warnings.join(' ')).toMatch(/can freeze/)
    expect(dryingEstimate({ ...cold, airTempC: 6 }).warnings.join(' ')).not.toMatch(/can freeze/)
    expect(dryingEstimate({ ...cold, airTempC: 4, freeWaterKg: 0 }).warnings).toEqual([]) // a dry cast does not
  })

  it('warns outside Stull\'s RH range and above the 49 °C guard', () => {
    expect(dryingEstimate({ freeWaterKg: 1, exposedAreaM2: 1, airTempC: 30, relHumidityPct: 3, airSpeedMs: 1 }).warnings.join(' '))
      .toMatch(/5–99 %/)
    expect(dryingEstimate({ freeWaterKg: 1, exposedAreaM2: 1, airTempC: 50, relHumidityPct: 20, airSpeedMs: 1 }).warnings.join(' '))
      .toMatch(/49 °C/)
  })

  it('throws a named error on bad input', () => {
    const ok = { freeWaterKg: 1, exposedAreaM2: 1, airTempC: 20, relHumidityPct: 50, airSpeedMs: 1 }
    expect(fieldOf(() => dryingEstimate({ ...ok, exposedAreaM2: 0 }))).toBe('exposedAreaM2')
    expect(fieldOf(() => dryingEstimate({ ...ok, freeWaterKg: -1 }))).toBe('freeWaterKg')
    expect(fieldOf(() => dryingEstimate({ ...ok, relHumidityPct: 120 }))).toBe('relHumidityPct')
    expect(fieldOf(() => dryingEstimate({ ...ok, airSpeedMs: -0.1 }))).toBe('airSpeedMs')
    expect(fieldOf(() => dryingEstimate({ ...ok, airTempC: 60 }))).toBe('airTempC')
    expect(fieldOf(() => dryingEstimate({ ...ok, fallingRateFactor: 0.5 }))).toBe('fallingRateFactor')
  })
})

describe('constantWeight (common practice: 0.1 % over at least 24 h, this model\'s choice)', () => {
  const h = (hours: number) => new Date(Date.UTC(2027, 2, 1, 8) + hours * 3_600_000)

  it('needs two weighings at least a day apart', () => {
    expect(constantWeight([]).isDry).toBe(false)
    expect(constantWeight([{ kg: 10, at: h(0) }]).isDry).toBe(false)
    // the same weight 20 h apart is not yet proof
    const soon = constantWeight([{ kg: 10, at: h(0) }, { kg: 10, at: h(20) }])
    expect(soon).toMatchObject({ isDry: false, changePct: null })
    expect(soon.message).toMatch(/24 hours/)
  })

  it('is dry within 0.1 % of the later weighing, not beyond, either way', () => {
    // 10.009 → 10.000 kg over 24 h: 0.09 % (by hand)
    expect(constantWeight([{ kg: 10.009, at: h(0) }, { kg: 10, at: h(24) }])).toMatchObject({ isDry: true, changePct: expect.closeTo(0.09, 9), hoursApart: 24 })
    // 10.02 → 10.00 kg: 0.2 %, still drying
    expect(constantWeight([{ kg: 10.02, at: h(0) }, { kg: 10, at: h(30) }]).isDry).toBe(false)
    // took up 0.5 % in damp air: not constant
    expect(constantWeight([{ kg: 9.95, at: h(0) }, { kg: 10, at: h(26) }]).isDry).toBe(false)
  })

  it('compares the latest weighing with the latest one a day before it, in any order', () => {
    const w = [{ kg: 10, at: h(50) }, { kg: 10.5, at: h(0) }, { kg: 10.005, at: h(25) }, { kg: 10.2, at: h(20) }]
    expect(constantWeight(w)).toMatchObject({ isDry: true, hoursApart: 25 }) // 10.005 at 25 h vs 10 at 50 h: 0.05 %
  })

  it('allows at least 2 g on a small piece (a bench scale\'s step), 0.1 % on a big one', () => {
    // 1.000 → 0.998 kg: 0.2 %, but 2 g: within the floor
    expect(constantWeight([{ kg: 1, at: h(0) }, { kg: 0.998, at: h(24) }]).isDry).toBe(true)
    expect(constantWeight([{ kg: 1, at: h(0) }, { kg: 0.997, at: h(24) }]).isDry).toBe(false)
    // 20 kg: 0.1 % is 20 g
    expect(constantWeight([{ kg: 20.019, at: h(0) }, { kg: 20, at: h(24) }]).isDry).toBe(true)
    expect(constantWeight([{ kg: 20.03, at: h(0) }, { kg: 20, at: h(24) }]).isDry).toBe(false)
  })

  it('says what is missing: a weighing, a second one a day later, or a steady weight', () => {
    expect(constantWeight([]).message).toMatch(/Not weighed yet/)
    expect(constantWeight([{ kg: 10, at: h(0) }, { kg: 10, at: h(5) }]).message).toMatch(/second weighing at least 24 hours.*weighed 2 times, the first 5 h before the last/)
    expect(constantWeight([{ kg: 10, at: h(0) }]).message).toMatch(/second weighing at least 24 hours after an earlier one \(weighed once so far\)/)
    expect(constantWeight([{ kg: 10.5, at: h(0) }, { kg: 10, at: h(25) }]).message).toMatch(/^Still changing: 5\.00 % over 25 h/)
  })

  it('throws a named error on a bad weighing', () => {
    expect(fieldOf(() => constantWeight([{ kg: -1, at: h(0) }]))).toBe('weighings[0].kg')
    expect(fieldOf(() => constantWeight([{ kg: 1, at: new Date(Number.NaN) }]))).toBe('weighings[0].at')
  })
})

describe('constantWeightReachedAt', () => {
  const h = (hours: number) => new Date(Date.UTC(2027, 2, 1, 8) + hours * 3_600_000)
  it('is the earlier weighing of the first pair a day apart that holds', () => {
    // drying: 11 → 10.3 → 10.005 → 10.0 → 10.0 kg at 0, 24, 48, 72, 96 h: 10.005 (48 h) vs 10.0 (72 h) is 0.05 %
    const w = [[0, 11], [24, 10.3], [48, 10.005], [72, 10], [96, 10]].map(([t, kg]) => ({ kg: kg!, at: h(t!) }))
    expect(constantWeightReachedAt(w)).toEqual(h(48))
    expect(constantWeightReachedAt(w.slice(0, 3))).toBeNull()
    expect(constantWeightReachedAt([])).toBeNull()
  })
})

describe('dryMassGuide', () => {
  it('shows the computed dry mass with its 2 % uncertainty as a guide', () => {
    const g = dryMassGuide(1.098) // the 1 L beta cast (derived in plaster-mix.test.ts)
    expect(g.lowKg).toBeCloseTo(1.098 * 0.98, 12)
    expect(g.highKg).toBeCloseTo(1.098 * 1.02, 12)
    expect(g.label).toMatch(/about 1\.10 kg \(± 2 %; a guide only/)
  })

  it('reaches lower when the batch was over plan (the extra may have stayed in the bowl)', () => {
    // the case: 10 % over a batch planned with 5 % waste reads 1.10 / 1.05 = 4.8 % high
    const g = dryMassGuide(10, 10)
    expect(g.lowKg).toBeCloseTo((10 * 0.98) / 1.1, 12)
    expect(g.highKg).toBeCloseTo(10.2, 12)
    expect(g.label).toMatch(/10 % over plan/)
    // a short batch does not widen the range upward: the cast holds what its cavity holds
    expect(dryMassGuide(10, -5)).toMatchObject({ lowKg: expect.closeTo(9.8, 12), batchExcessPct: 0 })
    expect(fieldOf(() => dryMassGuide(10, Number.NaN))).toBe('batchExcessPct')
  })
})

describe('fallingRateFromWeighings', () => {
  it('is the median of actual ÷ estimated hours over the shop\'s pieces, at least 1', () => {
    // invented shop: pieces took 1.8, 2.2, 2.0 and 1.9 × the constant-rate estimate, one was left a week
    const pieces = [[10, 18], [12, 26.4], [8, 16], [10, 19], [10, 168]].map(([e, a]) => ({ estimatedHours: e!, actualHours: a! }))
    expect(fallingRateFromWeighings(pieces)).toEqual({ factor: expect.closeTo(2.0, 9), count: 5, source: 'shop' }) // median of 1.8, 1.9, 2.0, 2.2, 16.8
    const faster = [5, 4, 6, 5, 5].map(a => ({ estimatedHours: 10, actualHours: a }))
    expect(fallingRateFromWeighings(faster)).toMatchObject({ factor: 1, source: 'shop' })
    expect(fieldOf(() => fallingRateFromWeighings('x' as never))).toBe('pieces')
  })

  it('keeps the default 1 with fewer than 5 usable pieces, and says so', () => {
    const four = [[10, 18], [12, 26.4], [8, 16], [10, 19]].map(([e, a]) => ({ estimatedHours: e!, actualHours: a! }))
    expect(fallingRateFromWeighings(four)).toEqual({ factor: 1, count: 4, source: 'default' })
    expect(fallingRateFromWeighings([])).toEqual({ factor: 1, count: 0, source: 'default' })
    // a piece without an estimate (saturated air) or with no time says nothing
    expect(fallingRateFromWeighings([...four, { estimatedHours: 0, actualHours: 5 }, { estimatedHours: 5, actualHours: Number.NaN }]).source).toBe('default')
    expect(fallingRateNote({ factor: 1, count: 4, source: 'default' })).toMatch(/4 of 5 pieces/)
    expect(fallingRateNote({ factor: 2, count: 5, source: 'shop' })).toMatch(/× 2\.00 from 5 of the shop's pieces/)
  })
})

describe('dryingGuard', () => {
  it('passes 49 °C (120 °F) and below, warns above', () => {
    expect(dryingGuard(40)).toBeNull() // gypsum specimens are commonly dried at 40 °C (ASHRAE 2004, gypsum sorption-isotherm drying protocols)
    expect(dryingGuard(49)).toBeNull() // the trade's limit: moulds safe from calcination up to 120 °F (49 °C), common practice
    expect(dryingGuard(fToC(120))).toBeNull() // 48.9 °C
    expect(dryingGuard(49.5)).toMatch(/above 49 °C/)
    expect(dryingGuard(65)).toMatch(/combined water/)
  })

  it('throws on a non-number', () => {
    expect(fieldOf(() => dryingGuard(Number.NaN))).toBe('tempC')
  })
})

describe('dryness', () => {
  it('reports the free water left against the computed dry mass', () => {
    const wet = dryness({ weighedKg: 1.5737, dryMassKg: 1.0981 }) // the 1 L beta cast just demoulded
    expect(wet.freeWaterKg).toBeCloseTo(0.4756, 4)
    expect(wet.freeWaterPct).toBeCloseTo(43.31, 2) // 0.4756 / 1.0981
    expect(wet.isDry).toBe(false)
  })

  it('calls a piece dry within 0.5 % (common practice)', () => {
    expect(dryness({ weighedKg: 1.104, dryMassKg: 1.1 }).isDry).toBe(true) // 0.36 %
    expect(dryness({ weighedKg: 1.106, dryMassKg: 1.1 }).isDry).toBe(false) // 0.55 %
  })

  it('warns when a piece weighs clearly less than its dry mass', () => {
    const d = dryness({ weighedKg: 1.05, dryMassKg: 1.1 })
    expect(d.freeWaterKg).toBeLessThan(0)
    expect(d.isDry).toBe(true)
    expect(d.warnings).toHaveLength(1)
  })

  it('throws a named error on bad input', () => {
    expect(fieldOf(() => dryness({ weighedKg: 0, dryMassKg: 1 }))).toBe('weighedKg')
    expect(fieldOf(() => dryness({ weighedKg: 1, dryMassKg: -1 }))).toBe('dryMassKg')
  })
})
