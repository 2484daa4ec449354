import { describe, it, expect } from 'vitest'
import {
  GRADE_PRESETS,
  GRADE_PRESET_PROVENANCE,
  GYPSUM_PER_HEMIHYDRATE,
  GYPSUM_WATER_FRACTION,
  HYDRATION_WATER_PER_HEMIHYDRATE,
  PLASTER_MOLAR_MASS,
  PlasterInputError,
  SOUTHARD_HYDRATION_HEAT,
  STOICHIOMETRIC_CONSISTENCY,
  assertPlasterGrade,
  batchForCavity,
  castFromBatch,
  demouldWindow,
  mixSummary,
  plasterGradeFromPreset,
  relativeStrength,
  slurryTemperature,
  type PlasterGrade,
  type PlasterGradePresetKey,
} from '#shared/utils/plaster'

const beta = GRADE_PRESETS['beta-casting']
const alpha = GRADE_PRESETS['alpha-casting']
const presetKeys = Object.keys(GRADE_PRESETS) as PlasterGradePresetKey[]

/** |actual / expected − 1| < relTol */
function expectNear(actual: number, expected: number, relTol: number) {
  expect(Math.abs(actual / expected - 1)).toBeLessThan(relTol)
}

function expectInputError(fn: () => unknown, field: string, message?: RegExp | string) {
  let caught: unknown
  try {
    fn()
  }
  catch (e) {
    caught = e
  }
  expect(caught).toBeInstanceOf(PlasterInputError)
  expect((caught as PlasterInputError).field).toBe(field)
  if (message !== undefined) expect((caught as PlasterInputError).message).toMatch(message)
}

describe('stoichiometry', () => {
  it('molar masses follow from the IUPAC atomic weights', () => {
    expect(PLASTER_MOLAR_MASS.water).toBeCloseTo(18.015, 3) // IUPAC: 2 × 1.008 + 15.999
    expect(PLASTER_MOLAR_MASS.anhydrite).toBeCloseTo(136.134, 3) // IUPAC: 40.078 + 32.06 + 4 × 15.999
    expect(PLASTER_MOLAR_MASS.hemihydrate).toBeCloseTo(145.142, 2) // IUPAC: 136.134 + 9.0075 = 145.1415
    expect(PLASTER_MOLAR_MASS.gypsum).toBeCloseTo(172.164, 3) // IUPAC: 136.134 + 36.030
  })

  it('100 g hemihydrate binds 18.618 g water and becomes 118.618 g gypsum', () => {
    expect(100 * HYDRATION_WATER_PER_HEMIHYDRATE).toBeCloseTo(18.618, 3) // IUPAC: 1.5 × 18.015 / 145.1415
    expect(100 * GYPSUM_PER_HEMIHYDRATE).toBeCloseTo(118.618, 3) // IUPAC: 172.164 / 145.1415
    expect(STOICHIOMETRIC_CONSISTENCY).toBeCloseTo(18.618, 3) // same figure as parts per 100
  })

  it('gypsum is 20.93 % combined water and calcining to hemihydrate drives off three quarters', () => {
    expect(100 * GYPSUM_WATER_FRACTION).toBeCloseTo(20.93, 2) // IUPAC: 36.030 / 172.164
    const lostToHemihydrate = (1.5 * PLASTER_MOLAR_MASS.water) / PLASTER_MOLAR_MASS.gypsum
    expect(lostToHemihydrate / GYPSUM_WATER_FRACTION).toBeCloseTo(0.75, 10) // 1.5 of 2 mol water
    expect(100 * lostToHemihydrate).toBeCloseTo(15.7, 2) // IUPAC: 27.0225 / 172.164 = 15.70 %
  })

  it('heats of hydration are Southard 1940: β 132.6 J/g, α 118.2 J/g', () => {
    expect(SOUTHARD_HYDRATION_HEAT.beta).toBeCloseTo(132.6, 1) // Southard 1940: −4600 cal/mol × 4.184 / 145.142
    expect(SOUTHARD_HYDRATION_HEAT.alpha).toBeCloseTo(118.2, 1) // Southard 1940: −4100 cal/mol × 4.184 / 145.142
    const kJ = (grams: number, jPerG: number) => (grams * jPerG) / 1000
    expect(kJ(1000, beta.hydrationHeat)).toBeCloseTo(132.6, 1) // 1 kg β → 132.6 kJ (Southard 1940)
    expect(kJ(1000, alpha.hydrationHeat)).toBeCloseTo(118.2, 1) // 1 kg α → 118.2 kJ (Southard 1940)
    expectNear(kJ(925.7, beta.hydrationHeat), 122.7, 0.01) // derived: the 1 L batch's 925.7 g × 132.6 J/g (Southard 1940) = 122.7 kJ, ± 1 %
  })
})

describe('batchForCavity', () => {
  it('fills 1.000 L with beta at 70: 0.9257 kg plaster, 0.6480 kg water, 1.574 kg/L', () => {
    const b = batchForCavity({ cavityLitres: 1, consistency: 70, grade: beta, wastePct: 0 })
    expect(b.plasterKg).toBeCloseTo(0.9257, 4) // derived: 1 / (1/2.63 + 0.70) = 0.9257 kg
    expect(b.waterKg).toBeCloseTo(0.648, 4) // derived: 0.9257 × 0.70 = 0.6480 kg
    expect(b.slurryDensity).toBeCloseTo(1.574, 3) // derived: (0.9257 + 0.6480) kg / 1.000 L
    expect(b.slurryKg).toBeCloseTo(1.5737, 4) // derived: 925.7 g + 648.0 g
    expect(b.slurryLitres).toBe(1)
  })

  it('adds waste on top of the cavity', () => {
    const b = batchForCavity({ cavityLitres: 1, consistency: 70, grade: beta, wastePct: 20 })
    expect(b.slurryLitres).toBeCloseTo(1.2, 12)
    expect(b.plasterKg).toBeCloseTo(0.9257 * 1.2, 4) // derived: 20 % more of the same slurry
  })

  it('treats a missing wastePct as none', () => {
    const b = batchForCavity({ cavityLitres: 2, consistency: 70, grade: beta })
    expect(b.slurryLitres).toBe(2)
  })

  it('throws a named error on bad input', () => {
    expectInputError(() => batchForCavity({ cavityLitres: 0, consistency: 70, grade: beta }), 'cavityLitres', /greater than 0/)
    expectInputError(() => batchForCavity({ cavityLitres: -1, consistency: 70, grade: beta }), 'cavityLitres')
    expectInputError(() => batchForCavity({ cavityLitres: Number.NaN, consistency: 70, grade: beta }), 'cavityLitres')
    expectInputError(() => batchForCavity({ cavityLitres: Infinity, consistency: 70, grade: beta }), 'cavityLitres')
    expectInputError(() => batchForCavity({ cavityLitres: 1, consistency: 70, grade: beta, wastePct: -5 }), 'wastePct')
    expectInputError(
      () => batchForCavity({ cavityLitres: 1, consistency: 18.5, grade: beta }),
      'consistency',
      'consistency must be between 18.6 and 200 (parts water per 100 parts plaster)',
    )
    expectInputError(() => batchForCavity({ cavityLitres: 1, consistency: 201, grade: beta }), 'consistency')
    expectInputError(() => batchForCavity(null as never), 'input')
  })
})

describe('castFromBatch', () => {
  it('gives the set cast of the 1 L beta batch: dry 1.098 kg, free water 0.4757 kg, porosity 0.527', () => {
    const c = castFromBatch({ plasterKg: 0.925730376627948, waterKg: 0.6480112636395635, grade: beta })
    expect(c.dryMassKg).toBeCloseTo(1.098, 3) // derived: 925.7 g × 1.18618 = 1098.1 g
    expect(c.freeWaterKg).toBeCloseTo(0.4757, 4) // derived: 648.0 g − 925.7 g × 0.18618 = 475.7 g
    expect(c.porosity).toBeCloseTo(0.527, 3) // derived: 1 − (1.0981 kg / 2.32 kg/L) / 1.000 L
    expect(c.dryDensity).toBeCloseTo(1.098, 3) // derived per 100 g: 118.62 g / (100/2.63 + 70) cm³ = 118.62 / 108.02
    expect(c.boundWaterKg).toBeCloseTo(0.9257 * 0.18618, 4) // IUPAC: 18.618 per 100
    expect(c.wetMassKg).toBeCloseTo(1.5737, 4) // nothing leaves the mould while it sets
  })

  it('matches the derived dry densities and porosities at other consistencies', () => {
    const at = (grade: PlasterGrade, c: number) => castFromBatch({ plasterKg: 1, waterKg: c / 100, grade })
    expect(at(beta, 60).porosity).toBeCloseTo(0.478, 3) // derived: 1 − (1.18618/2.32) / (1/2.63 + 0.60)
    expect(at(beta, 60).dryDensity).toBeCloseTo(1.21, 3) // derived: 1.18618 / (1/2.63 + 0.60) = 1.210
    expect(at(beta, 74).porosity).toBeCloseTo(0.544, 3) // derived: 1 − (1.18618/2.32) / (1/2.63 + 0.74)
    expect(at(beta, 74).dryDensity).toBeCloseTo(1.059, 3) // derived: 1.18618 / (1/2.63 + 0.74) = 1.059
    const alpha2757 = { ...alpha, powderDensity: 2.757 }
    expect(at(alpha2757, 38).dryDensity).toBeCloseTo(1.597, 3) // derived: 1.18618 / (1/2.757 + 0.38) = 1.597
    expect(at(alpha2757, 45).dryDensity).toBeCloseTo(1.46, 3) // derived: 1.18618 / (1/2.757 + 0.45) = 1.460
  })

  it('puts beta casts at the porosity Sattler reports for commercial products', () => {
    for (const c of [60, 65, 70, 75]) {
      const p = castFromBatch({ plasterKg: 1, waterKg: c / 100, grade: beta }).porosity
      expect(p).toBeGreaterThanOrEqual(0.45) // Sattler 1997: commercial β products p = 0.45–0.55
      expect(p).toBeLessThanOrEqual(0.55)
    }
  })

  it('counts impurity as inert mass', () => {
    const c = castFromBatch({ plasterKg: 1, waterKg: 0.7, grade: { ...beta, purity: 0.9 } })
    expect(c.dryMassKg).toBeCloseTo(0.9 * 1.18618 + 0.1, 5) // derived: the hemihydrate becomes gypsum, the rest stays as it is
    expect(c.boundWaterKg).toBeCloseTo(0.9 * 0.18618, 5)
  })

  it('binds all the water when there is just too little to hydrate everything', () => {
    const c = castFromBatch({ plasterKg: 1, waterKg: 0.186, grade: beta })
    expect(c.freeWaterKg).toBe(0)
    expect(c.boundWaterKg).toBe(0.186)
  })

  it('throws a named error on bad input', () => {
    expectInputError(() => castFromBatch({ plasterKg: 0, waterKg: 0.7, grade: beta }), 'plasterKg')
    expectInputError(() => castFromBatch({ plasterKg: 1, waterKg: -1, grade: beta }), 'waterKg')
    expectInputError(() => castFromBatch({ plasterKg: 1, waterKg: 0.1, grade: beta }), 'waterKg', /18\.6/)
    expectInputError(() => castFromBatch({ plasterKg: 1, waterKg: 3, grade: beta }), 'waterKg')
  })
})

describe('slurryTemperature', () => {
  it('stays put when water and powder are at the same temperature', () => {
    expect(slurryTemperature({ plasterKg: 1, waterKg: 0.7, waterTempC: 20, powderTempC: 20 })).toBeCloseTo(20, 10)
  })

  it('balances heat: 0.7 kg water at 30 °C with 1 kg powder at 10 °C gives 25.62 °C', () => {
    // By hand: (0.7 × 4.18 × 30 + 1 × 0.82 × 10) / (0.7 × 4.18 + 1 × 0.82) = 95.98 / 3.746 = 25.62
    // (water 4.18 J/g·K, IAPWS-95 4.182; hemihydrate ≈ 0.82 J/g·K = Cp 119.4 J/mol·K ÷ 145.142, the Cp recalled from memory)
    expect(slurryTemperature({ plasterKg: 1, waterKg: 0.7, waterTempC: 30, powderTempC: 10 })).toBeCloseTo(25.62, 2)
  })

  it('throws a named error on bad input', () => {
    expectInputError(() => slurryTemperature({ plasterKg: 1, waterKg: 0.7, waterTempC: 101, powderTempC: 20 }), 'waterTempC')
    expectInputError(() => slurryTemperature({ plasterKg: 1, waterKg: 0.7, waterTempC: 20, powderTempC: Number.NaN }), 'powderTempC')
    expectInputError(() => slurryTemperature({ plasterKg: 1, waterKg: 0, waterTempC: 20, powderTempC: 20 }), 'waterKg')
  })
})

describe('relativeStrength', () => {
  it('beta at 60 is about 1.75 × as strong as at 80 (n = 3)', () => {
    // By hand: 1 − p = 0.51128 / 0.98023 = 0.52160 at 60, 0.51128 / 1.18023 = 0.43321 at 80;
    // (0.52160 / 0.43321)^3 = 1.2040^3 = 1.745 (σ ∝ (1 − p)^n, n = 3 within Sattler 1997's 2.5–3.5)
    expect(relativeStrength({ grade: beta, consistency: 60, refConsistency: 80 })).toBeCloseTo(1.745, 3)
  })

  it('spans 1.59–1.92 over the exponents Sattler 1997 reports (2.5–3.5)', () => {
    const at = (exponent: number) => relativeStrength({ grade: beta, consistency: 60, refConsistency: 80, exponent })
    expect(at(2.5)).toBeCloseTo(1.59, 2) // derived: 1.2040^2.5 = 1.591 (n from Sattler 1997)
    expect(at(3.5)).toBeCloseTo(1.92, 2) // derived: 1.2040^3.5 = 1.915 (n from Sattler 1997)
  })

  it('is 1 at the grade default and falls with more water', () => {
    expect(relativeStrength({ grade: beta, consistency: 70 })).toBe(1)
    expect(relativeStrength({ grade: beta, consistency: 75 })).toBeLessThan(1)
  })

  it('throws a named error on bad input', () => {
    expectInputError(() => relativeStrength({ grade: beta, consistency: 70, refConsistency: 10 }), 'refConsistency')
    expectInputError(() => relativeStrength({ grade: beta, consistency: 70, exponent: 0 }), 'exponent')
  })
})

describe('grade presets', () => {
  it('carries the three labelled grades', () => {
    expect(GRADE_PRESETS['beta-casting'].label).toBe('Beta fine casting plaster')
    expect(GRADE_PRESETS['beta-fibrous'].label).toBe('Beta fibrous plaster')
    expect(GRADE_PRESETS['alpha-casting'].label).toBe('Alpha hard casting plaster')
  })

  it('uses the design and handbook powder densities and Southard heats', () => {
    expect(beta.powderDensity).toBe(2.63) // inside Ullmann's 2.619–2.637 (recalled from memory)
    expect(GRADE_PRESETS['beta-fibrous'].powderDensity).toBe(2.63)
    expect(alpha.powderDensity).toBeGreaterThanOrEqual(2.757) // α 2.757 (Ullmann's, recalled) to 2.76 (an Elsevier reference text)
    expect(alpha.powderDensity).toBeLessThanOrEqual(2.76)
    expect(beta.hydrationHeat).toBeCloseTo(132.6, 1) // Southard 1940
    expect(alpha.hydrationHeat).toBeCloseTo(118.2, 1) // Southard 1940
  })

  it('gauges alpha stiffer than beta', () => {
    expect(alpha.form).toBe('alpha')
    expect(alpha.consistency.default).toBeGreaterThanOrEqual(28) // common practice: about 28–40, default ~35
    expect(alpha.consistency.default).toBeLessThanOrEqual(40)
    expect(alpha.consistency.default).toBeLessThan(beta.consistency.default)
  })

  it('opens the beta casting window in 20–45 min at 70 in a 20 °C shop', () => {
    const w = demouldWindow({ grade: beta, consistency: 70, slurryTempC: 20, maxDwellMinutes: 0, setFactor: 1 })
    expect(w.openMinutes).toBeGreaterThanOrEqual(20) // 20–45 min: common practice (no published source)
    expect(w.openMinutes).toBeLessThanOrEqual(45)
    expect(w.warnings).toEqual([])
  })

  it('passes the model\'s own grade check', () => {
    for (const key of presetKeys) expect(() => assertPlasterGrade(GRADE_PRESETS[key])).not.toThrow()
  })

  it('has a provenance for every field of every preset', () => {
    const fields: (keyof PlasterGrade)[] = ['form', 'powderDensity', 'consistency', 'demouldMinutesRef',
      'setTimeWaterExponent', 'temperatureFactors', 'hydrationHeat', 'setExpansionPct', 'purity']
    const statuses = ['published', 'derived', 'shop starting point (common practice)']
    for (const key of presetKeys) {
      for (const field of fields) {
        const p = GRADE_PRESET_PROVENANCE[key][field]
        expect(statuses).toContain(p.status)
        expect(p.source.length).toBeGreaterThan(10)
      }
      expect(GRADE_PRESET_PROVENANCE[key].hydrationHeat.source).toMatch(/Southard/)
    }
  })

  it('is frozen, and plasterGradeFromPreset gives an editable copy', () => {
    expect(Object.isFrozen(beta.consistency)).toBe(true)
    const copy = plasterGradeFromPreset('beta-casting')
    copy.consistency.default = 65
    copy.temperatureFactors[0]![1] = 2
    expect(beta.consistency.default).toBe(70)
    expect(beta.temperatureFactors[0]![1]).toBe(1.6)
    expectInputError(() => plasterGradeFromPreset('gamma' as PlasterGradePresetKey), 'key')
  })
})

describe('assertPlasterGrade', () => {
  it('names the bad field', () => {
    expectInputError(() => assertPlasterGrade({ ...beta, form: 'gamma' }), 'grade.form')
    expectInputError(() => assertPlasterGrade({ ...beta, powderDensity: 0 }), 'grade.powderDensity')
    expectInputError(() => assertPlasterGrade({ ...beta, purity: 1.2 }), 'grade.purity')
    expectInputError(() => assertPlasterGrade({ ...beta, consistency: { min: 60, max: 80, default: 90 } }), 'grade.consistency.default')
    expectInputError(() => assertPlasterGrade({ ...beta, consistency: { min: 80, max: 60, default: 70 } }), 'grade.consistency.max')
    expectInputError(() => assertPlasterGrade({ ...beta, consistency: { min: 10, max: 60, default: 50 } }), 'grade.consistency.min', /18\.6/)
    expectInputError(() => assertPlasterGrade({ ...beta, temperatureFactors: [] }), 'grade.temperatureFactors')
    expectInputError(() => assertPlasterGrade({ ...beta, temperatureFactors: [[20, 1], [10, 2]] }), 'grade.temperatureFactors[1][0]')
    expectInputError(() => assertPlasterGrade({ ...beta, temperatureFactors: [[20, 1.2]] }), 'grade.temperatureFactors', /1 at 20/)
    expectInputError(() => assertPlasterGrade({ ...beta, temperatureFactors: [[20, 1], [30, -1]] }), 'grade.temperatureFactors[1][1]')
    expectInputError(() => assertPlasterGrade('beta'), 'grade')
  })

  it('is a real Error subclass with the field on it', () => {
    const e = new PlasterInputError('cavityLitres', 'cavityLitres must be greater than 0')
    expect(e).toBeInstanceOf(Error)
    expect(e.name).toBe('PlasterInputError')
    expect(e.field).toBe('cavityLitres')
  })
})

describe('mixSummary', () => {
  const base = {
    cavityLitres: 1,
    grade: beta,
    consistency: 70,
    wastePct: 0,
    waterTempC: 20,
    powderTempC: 20,
    shopTempC: 20,
    setFactor: 1,
    maxDwellMinutes: 60,
  }

  it('puts the whole mix card together for the 1 L beta example', () => {
    const m = mixSummary(base)
    expect(m.batch.plasterKg).toBeCloseTo(0.9257, 4) // derived: 1 / (1/2.63 + 0.70) = 0.9257 kg
    expect(m.slurryTempC).toBeCloseTo(20, 10)
    expect(m.window.openMinutes).toBeCloseTo(30, 10) // the beta casting preset's reference time
    expect(m.window.closeMinutes).toBeCloseTo(90, 10) // open + dwell
    expect(m.cast.dryMassKg).toBeCloseTo(1.098, 3) // derived: 0.9257 kg × 1.18618 = 1.098 kg
    expect(m.relativeStrength).toBeCloseTo(1, 12)
    expect(m.adiabaticRiseC).toBeCloseTo(37, 0) // derived: 132.6 J/g / 3.588 J/K per g powder = 37 K at 0.70
    expect(m.peakTempUpperBoundC).toBeCloseTo(m.slurryTempC + m.adiabaticRiseC, 12)
    expect(m.burnCaution).toBe(false) // 1.57 kg of slurry: under the 5 kg caution mass
    expect(m.warnings).toEqual([])
  })

  it('ends the set curve past 99 % hydration, passing 0.9 at the demould time', () => {
    const { setCurve, window } = mixSummary(base)
    expect(setCurve[0]).toEqual({ minutes: 0, hydration: 0, riseC: 0 })
    expect(setCurve.at(-1)!.minutes).toBe(Math.ceil(window.openMinutes * 1.5))
    expect(setCurve.at(-1)!.hydration).toBeGreaterThan(0.99)
    expect(setCurve.find(p => p.minutes === 30)!.hydration).toBeCloseTo(0.9, 10) // the illustrative curve is scaled to α = 0.9 at demould (design choice)
  })

  it('uses the heat-balance slurry temperature for the window', () => {
    const cold = mixSummary({ ...base, waterTempC: 5, powderTempC: 5 })
    expect(cold.slurryTempC).toBeCloseTo(5, 10)
    expect(cold.window.openMinutes).toBeCloseTo(30 * 1.45, 10) // preset table: 1.45 at 5 °C
  })

  it('leaves the waste out of the cast figures', () => {
    const m = mixSummary({ ...base, wastePct: 25 })
    expect(m.batch.slurryLitres).toBeCloseTo(1.25, 12)
    expect(m.cast.dryMassKg).toBeCloseTo(1.098, 3) // still the 1 L cavity's cast
  })

  it('raises the burn caution for a big gauge and warns about a cold shop', () => {
    const m = mixSummary({ ...base, cavityLitres: 5, shopTempC: 2 })
    expect(m.batch.slurryKg).toBeGreaterThan(5)
    expect(m.burnCaution).toBe(true) // 20 + 37 °C ≥ 45 °C (NSEAD guide) with ≥ 5 kg slurry (common practice)
    expect(m.warnings.some(w => /freezing/.test(w))).toBe(true)
    expect(m.warnings.some(w => /skin/.test(w))).toBe(true)
  })

  it('caps the burn caution\'s peak at 100 °C, where water boils', () => {
    // hot water and a stiff mix: slurry + adiabatic rise passes 100 °C; the bound does not
    const m = mixSummary({ ...base, cavityLitres: 5, consistency: 30, waterTempC: 60, powderTempC: 60 })
    expect(m.slurryTempC + m.adiabaticRiseC).toBeGreaterThan(100)
    expect(m.peakTempUpperBoundC).toBe(100) // boiling point of water at sea level (definition)
    expect(m.warnings.join(' ')).toMatch(/about 100 °C/)
  })

  it('refuses a window hotter than the grade\'s table and names the field typed for a freezing mix', () => {
    expectInputError(() => mixSummary({ ...base, waterTempC: 90, powderTempC: 20 }), 'waterTempC')
    // water at 0 °C with powder at −20 °C: the slurry would be below 0 °C; the error names the powder
    expectInputError(() => mixSummary({ ...base, waterTempC: 0, powderTempC: -20 }), 'powderTempC')
    expect(() => mixSummary({ ...base, waterTempC: 0, powderTempC: -20 })).toThrow(/freeze/)
  })

  it('flags strength outside the grade\'s consistency range as an extrapolation', () => {
    expect(mixSummary(base).strengthExtrapolated).toBe(false)
    const stiff = mixSummary({ ...base, consistency: 18.6 })
    expect(stiff.strengthExtrapolated).toBe(true)
    expect(stiff.relativeStrength).toBeGreaterThan(5) // the porosity law far past the 60–80 range it was measured on
    expect(stiff.warnings.join(' ')).toMatch(/extrapolation.*60–80/)
  })

  it('throws a named error on bad input', () => {
    expectInputError(() => mixSummary({ ...base, shopTempC: 80 }), 'shopTempC')
    expectInputError(() => mixSummary({ ...base, setFactor: 0 }), 'setFactor')
    expectInputError(() => mixSummary({ ...base, maxDwellMinutes: -1 }), 'maxDwellMinutes')
    expectInputError(() => mixSummary({ ...base, grade: { ...beta, hydrationHeat: Number.NaN } }), 'grade.hydrationHeat')
  })
})
