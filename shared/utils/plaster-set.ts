/**
 * Set, demould window, set curve, heat of hydration and the shop's calibration factor.
 * Re-exported from `plaster.ts`. Pure: no I/O, no framework import.
 */
import {
  GYPSUM_SPECIFIC_HEAT,
  HEMIHYDRATE_SPECIFIC_HEAT,
  HYDRATION_WATER_PER_HEMIHYDRATE,
  PLASTER_LIMITS,
  PlasterInputError,
  WATER_SPECIFIC_HEAT,
  assertPlasterGrade,
  assertPlasterNumber,
  assertPlasterObject,
  interpolateTemperatureFactor,
  type PlasterGrade,
} from './plaster-core'

/**
 * Avrami (nucleation-and-growth) exponent of the illustrative set curve: 2.5, inside the 2–3
 * usually reported for hemihydrate hydration (recalled from memory, unverified: Avrami–Erofe'ev fits
 * are reported in J. Synchrotron Rad. (2019), "A kinetic and mechanistic study into the
 * transformation of calcium sulfate hemihydrate to dihydrate", but no n we could read).
 */
export const SET_CURVE_AVRAMI_EXPONENT = 2.5

/** Hydration the set curve reaches at the demould-ready time: 0.9 (design choice, illustrative). */
export const SET_CURVE_HYDRATION_AT_DEMOULD = 0.9

/** Set factors outside 0.3–3 draw a warning: beyond that an additive dominates the set (common practice). */
const SET_FACTOR_WARN = { min: 0.3, max: 3 }

/** Slurry temperatures outside 5–40 °C draw a warning (Ridge, Nature 184, 1959; common practice for the cold side). */
const SLURRY_WARN_C = { min: 5, max: 40 }

/** One point of the set curve. */
export interface PlasterSetPoint {
  minutes: number
  /** degree of hydration, 0..1 */
  hydration: number
  /** adiabatic temperature rise so far, °C (an upper bound: no heat loss) */
  riseC: number
}

/** The demould window: open when demould-ready, closed when the mould's dwell runs out. */
export interface PlasterDemouldWindow {
  openMinutes: number
  closeMinutes: number
  warnings: string[]
}

/** Checks consistency against the physical limits (18.6, the water hydration binds, to 200). */
export function assertPlasterConsistency(value: unknown, field = 'consistency'): number {
  return assertPlasterNumber(value, field, PLASTER_LIMITS.consistency)
}

/** Set-time multiplier of `grade` at `slurryTempC` (piecewise-linear table, flat beyond its ends). */
export function setTimeTemperatureFactor(grade: PlasterGrade, slurryTempC: number): number {
  const g = assertPlasterGrade(grade)
  const t = assertPlasterNumber(slurryTempC, 'slurryTempC', PLASTER_LIMITS.slurryTempC)
  return interpolateTemperatureFactor(g.temperatureFactors, t)
}

/**
 * Minutes from end of mixing to demould-ready:
 * demouldMinutesRef × (c / c_ref)^m × f(T_slurry) × setFactor, with c_ref the grade's default
 * consistency, m its water exponent and f its temperature table (the design's model; the
 * constants are shop starting points the register calibrates). setFactor < 1 is an accelerator,
 * > 1 a retarder (or the shop's calibration factor).
 */
export function demouldReadyMinutes(input: {
  grade: PlasterGrade
  consistency: number
  slurryTempC: number
  setFactor?: number
}): number {
  const i = assertPlasterObject(input, 'input')
  const grade = assertPlasterGrade(i.grade)
  const c = assertPlasterConsistency(i.consistency)
  const setFactor = assertPlasterNumber(i.setFactor ?? 1, 'setFactor', PLASTER_LIMITS.setFactor)
  const water = (c / grade.consistency.default) ** grade.setTimeWaterExponent
  return grade.demouldMinutesRef * water * setTimeTemperatureFactor(grade, i.slurryTempC as number) * setFactor
}

function windowWarnings(grade: PlasterGrade, c: number, t: number, setFactor: number): string[] {
  const warnings: string[] = []
  if (t < SLURRY_WARN_C.min) {
    warnings.push(`Slurry at ${t.toFixed(1)} °C is below ${SLURRY_WARN_C.min} °C: the set slows and becomes unpredictable in the cold; use tempered water.`)
  }
  if (t > SLURRY_WARN_C.max) {
    warnings.push(`Slurry at ${t.toFixed(1)} °C is above ${SLURRY_WARN_C.max} °C: gypsum sets slower again above about 40 °C and not at all near 100 °C.`)
  }
  const table = grade.temperatureFactors
  if (t < table[0]![0]) {
    warnings.push(`Slurry at ${t.toFixed(1)} °C is below the grade's temperature table; the nearest table value was used.`)
  }
  if (c < grade.consistency.min || c > grade.consistency.max) {
    warnings.push(`Consistency ${c} is outside this grade's range ${grade.consistency.min}–${grade.consistency.max}.`)
  }
  if (setFactor < SET_FACTOR_WARN.min || setFactor > SET_FACTOR_WARN.max) {
    warnings.push(`Set factor ${setFactor} is outside ${SET_FACTOR_WARN.min}–${SET_FACTOR_WARN.max}: time a test gauge first.`)
  }
  return warnings
}

/**
 * The demould window, minutes after end of mixing: opens at `demouldReadyMinutes`, closes
 * `maxDwellMinutes` later (a rubber mould can hold a cast for hours; a rigid or gelatine mould
 * cannot). Warns on slurry below 5 °C or above 40 °C, consistency outside the grade's range,
 * and a set factor outside 0.3–3; refuses slurry hotter than the table's last point. The
 * opening is a shop starting point, shown as "about": 20–45 min for a beta casting plaster is
 * common practice (ASTM C59's 10–50 min limits are for the powder's needle set, not for when a
 * cast can leave its mould); the register's calibration is what makes it the shop's own.
 */
export function demouldWindow(input: {
  grade: PlasterGrade
  consistency: number
  slurryTempC: number
  maxDwellMinutes: number
  setFactor?: number
}): PlasterDemouldWindow {
  const i = assertPlasterObject(input, 'input')
  const grade = assertPlasterGrade(i.grade)
  const c = assertPlasterConsistency(i.consistency)
  const t = assertPlasterNumber(i.slurryTempC, 'slurryTempC', PLASTER_LIMITS.slurryTempC)
  const setFactor = assertPlasterNumber(i.setFactor ?? 1, 'setFactor', PLASTER_LIMITS.setFactor)
  const dwell = assertPlasterNumber(i.maxDwellMinutes, 'maxDwellMinutes', PLASTER_LIMITS.maxDwellMinutes)
  // Gypsum sets ever slower as it nears 100 °C (its solubility falls toward the hemihydrate's):
  // no window is given past the table's hottest point rather than a flat extrapolation.
  const hottest = grade.temperatureFactors[grade.temperatureFactors.length - 1]![0]
  if (t > hottest) {
    throw new PlasterInputError('slurryTempC', `The slurry would be at ${t.toFixed(1)} °C, above ${hottest} °C, the hottest point of this grade's temperature table: plaster sets slower and slower toward 100 °C and no demould time can be given. Use cooler water.`)
  }
  const openMinutes = demouldReadyMinutes({ grade, consistency: c, slurryTempC: t, setFactor })
  return { openMinutes, closeMinutes: openMinutes + dwell, warnings: windowWarnings(grade, c, t, setFactor) }
}

/**
 * Upper bound of the slurry's temperature rise, °C, if all the heat of hydration stayed in it:
 * ΔT = purity × hydrationHeat / C̄, per g of powder, where C̄ is the mean of the heat capacity
 * before (powder 0.82 + water 4.18 × w J/K) and after setting (gypsum 1.0815 × 1.18618, free
 * water, impurity as powder). Heat from Southard 1940; heat capacities in plaster-core.
 * Beta at 0.70 gives about 37 °C, at 0.60 about 42 °C (derived by hand with this formula; ±5 K for the
 * recalled hemihydrate heat capacity). Real casts lose heat.
 */
export function adiabaticRiseC(input: { grade: PlasterGrade; consistency: number }): number {
  const i = assertPlasterObject(input, 'input')
  const grade = assertPlasterGrade(i.grade)
  const w = assertPlasterConsistency(i.consistency) / 100
  // Water short of full hydration leaves some hemihydrate unreacted (matters only near 18.6).
  const bound = Math.min(w, grade.purity * HYDRATION_WATER_PER_HEMIHYDRATE)
  const reacted = bound / HYDRATION_WATER_PER_HEMIHYDRATE
  const before = HEMIHYDRATE_SPECIFIC_HEAT + w * WATER_SPECIFIC_HEAT
  const after = (1 - reacted) * HEMIHYDRATE_SPECIFIC_HEAT
    + (reacted + bound) * GYPSUM_SPECIFIC_HEAT
    + (w - bound) * WATER_SPECIFIC_HEAT
  return (reacted * grade.hydrationHeat) / ((before + after) / 2)
}

/**
 * Illustrative set curve: hydration α(t) = 1 − exp(−k t^n), Avrami n = 2.5, with k chosen so that
 * α = 0.9 at the demould-ready time; riseC = α × adiabatic rise (heat released is proportional to
 * conversion, Karmazsin, ASTM STP on hydration ratio of plasters). Points every `stepMinutes` from
 * 0, plus `untilMinutes` itself; at most 2001 points.
 */
export function setCurve(input: {
  grade: PlasterGrade
  consistency: number
  slurryTempC: number
  stepMinutes: number
  untilMinutes: number
  setFactor?: number
}): PlasterSetPoint[] {
  const i = assertPlasterObject(input, 'input')
  const step = assertPlasterNumber(i.stepMinutes, 'stepMinutes', PLASTER_LIMITS.stepMinutes)
  const until = assertPlasterNumber(i.untilMinutes, 'untilMinutes', PLASTER_LIMITS.untilMinutes)
  if (until / step > 2000) {
    throw new PlasterInputError('stepMinutes', 'stepMinutes must give at most 2000 steps up to untilMinutes')
  }
  const ready = demouldReadyMinutes(input)
  const rise = adiabaticRiseC({ grade: input.grade, consistency: input.consistency })
  const k = -Math.log(1 - SET_CURVE_HYDRATION_AT_DEMOULD)
  const point = (minutes: number): PlasterSetPoint => {
    const hydration = 1 - Math.exp(-k * (minutes / ready) ** SET_CURVE_AVRAMI_EXPONENT)
    return { minutes, hydration, riseC: hydration * rise }
  }
  const points: PlasterSetPoint[] = []
  for (let n = 0; n * step <= until; n++) points.push(point(n * step))
  if (points[points.length - 1]!.minutes < until) points.push(point(until))
  return points
}

function median(sorted: number[]): number {
  const mid = Math.floor(sorted.length / 2)
  return sorted.length % 2 ? sorted[mid]! : (sorted[mid - 1]! + sorted[mid]!) / 2
}

/**
 * The shop's calibration factor for a grade: the median of actual / predicted demould minutes
 * over the last `lastN` valid samples (default 20; samples in register order, oldest first).
 * The median keeps one botched pour from dragging the factor. Samples with a non-finite or
 * non-positive time are ignored. No valid sample gives factor 1. Multiply it into setFactor.
 */
export function calibrationFactor(
  samples: { predictedMinutes: number; actualMinutes: number }[],
  options: { lastN?: number } = {},
): { factor: number; count: number } {
  if (!Array.isArray(samples)) throw new PlasterInputError('samples', 'samples must be an array')
  const lastN = options.lastN ?? 20
  if (!Number.isInteger(lastN) || lastN < 1 || lastN > 10000) {
    throw new PlasterInputError('lastN', 'lastN must be a whole number between 1 and 10000')
  }
  const valid = samples.filter(s => typeof s === 'object' && s !== null
    && Number.isFinite(s.predictedMinutes) && Number.isFinite(s.actualMinutes)
    && s.predictedMinutes > 0 && s.actualMinutes > 0)
  const ratios = valid.slice(-lastN).map(s => s.actualMinutes / s.predictedMinutes).sort((a, b) => a - b)
  if (ratios.length === 0) return { factor: 1, count: 0 }
  return { factor: median(ratios), count: ratios.length }
}

/**
 * How long after the demould window opens a demould still counts as attended: half the
 * predicted set time, at least 15 minutes (design choice). A caster at the bench tests the cast
 * (a thumbnail scratch, the cast pulling from the mould) every few minutes once the window opens,
 * so a demould inside that span is close to the moment the cast was ready; one taken later (a
 * break, the end of a shift, overnight) says only that the cast was ready by then.
 */
export const CALIBRATION_ATTENDED = { minMinutes: 15, setShare: 0.5 } as const

/** What the register knows of one demoulded pour, for calibration. Instants are Dates. */
export interface CalibrationPour {
  mixingAt: Date | null
  demouldOpenAt: Date | null
  demouldCloseAt: Date | null
  demouldedAt: Date | null
  /** the model's minutes from the start of mixing to demould-ready, at set factor 1 */
  predictedMinutes: number | null
  /** minutes of gauging before the set clock starts (POUR_MIX_MINUTES_DEFAULT on the floor) */
  mixMinutes: number
  /** the caster marked the demould as taken before the window (when the register records it) */
  early?: boolean | null
}

/**
 * One calibration sample from a demoulded pour, or null when it does not count. Both sides are
 * the SET part only (from the end of mixing), since the factor scales the set and not the
 * gauging minutes. It counts only when taken inside the attended window: not before the window
 * opened (early: marked so, or derived from the times) and not later than the attended span
 * after it (CALIBRATION_ATTENDED) nor after the window closed.
 */
export function calibrationSample(p: CalibrationPour): { predictedMinutes: number; actualMinutes: number } | null {
  if (!p.mixingAt || !p.demouldOpenAt || !p.demouldedAt || p.predictedMinutes === null || p.early) return null
  const predicted = p.predictedMinutes - p.mixMinutes
  const actual = (p.demouldedAt.getTime() - p.mixingAt.getTime()) / 60_000 - p.mixMinutes
  if (!Number.isFinite(predicted) || !Number.isFinite(actual) || predicted <= 0 || actual <= 0) return null
  const afterOpen = (p.demouldedAt.getTime() - p.demouldOpenAt.getTime()) / 60_000
  const span = Math.max(CALIBRATION_ATTENDED.minMinutes, CALIBRATION_ATTENDED.setShare * predicted)
  if (afterOpen < 0 || afterOpen > span) return null
  if (p.demouldCloseAt && p.demouldedAt.getTime() > p.demouldCloseAt.getTime()) return null
  return { predictedMinutes: predicted, actualMinutes: actual }
}

/**
 * The one calibration of a grade from its demoulded pours in register order (oldest first):
 * the attended samples (calibrationSample) through calibrationFactor's median. `excluded` counts
 * the pours left out (early, late or without times), so a screen can say what stands behind it.
 */
export function calibrationFromPours(pours: CalibrationPour[], options: { lastN?: number } = {}) {
  const samples = pours.map(calibrationSample)
  const kept = samples.filter(s => s !== null)
  const { factor, count } = calibrationFactor(kept, options)
  return { factor, count, excluded: samples.length - kept.length, samples: kept }
}

/** The set factor a grade's pours use: the factor a lead applied, else 1 (the bare model). */
export function appliedSetFactor(calibration: { applied: boolean; appliedFactor: number | null } | null | undefined): number {
  if (!calibration?.applied || !calibration.appliedFactor || !Number.isFinite(calibration.appliedFactor)) return 1
  return calibration.appliedFactor
}

/**
 * How the board says where one pour's set time comes from: the grade's applied calibration
 * when the pour uses it ("calibrated from N pours"), the bare model at factor 1 ("shop starting
 * point"), else a factor set for this pour on the board.
 */
export function pourCalibrationNote(setFactor: number, applied: { factor: number; count: number } | null | undefined): string {
  const same = (a: number, b: number) => Math.abs(a - b) < 0.005
  if (applied && same(setFactor, applied.factor)) return calibrationNote({ applied: true, appliedFactor: applied.factor, appliedCount: applied.count })
  if (same(setFactor, 1)) return 'shop starting point, not calibrated'
  return `set time × ${setFactor.toFixed(2)}, set for this pour on the board`
}

/** How a screen says where a set time comes from: "calibrated from N pours" or the bare model. */
export function calibrationNote(calibration: { applied: boolean; appliedFactor: number | null; appliedCount: number } | null | undefined): string {
  if (!calibration?.applied || !calibration.appliedFactor) return 'shop starting point, not calibrated'
  return `calibrated from ${calibration.appliedCount} pour${calibration.appliedCount === 1 ? '' : 's'} (× ${calibration.appliedFactor.toFixed(2)})`
}
