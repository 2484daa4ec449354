/**
 * The plaster model: batch for a cavity, the set cast, slurry temperature, strength and the mix
 * card summary. The rest of the model lives in plaster-*.ts and is re-exported from here, so
 * `import { … } from 'shared/utils/plaster'` reaches all of it.
 *
 * Units everywhere: masses kg, volumes litres, temperatures °C, times minutes (drying: hours),
 * consistency = parts water per 100 parts plaster by mass (70 means water/plaster 0.70).
 * Pure: no I/O, no framework import. Bad input throws PlasterInputError naming the field.
 */
import {
  GYPSUM_DENSITY,
  HYDRATION_WATER_PER_HEMIHYDRATE,
  MIX_WATER_DENSITY,
  HEMIHYDRATE_SPECIFIC_HEAT,
  PLASTER_LIMITS,
  PlasterInputError,
  WATER_SPECIFIC_HEAT,
  assertPlasterGrade,
  assertPlasterNumber,
  assertPlasterObject,
  type PlasterGrade,
} from './plaster-core'
import {
  adiabaticRiseC,
  assertPlasterConsistency,
  demouldWindow,
  setCurve,
  type PlasterDemouldWindow,
  type PlasterSetPoint,
} from './plaster-set'

// `export *` (not named re-exports) lets Nuxt's auto-import scanner see each name once, from its own file.
export * from './plaster-core'
export * from './plaster-presets'
export * from './plaster-set'
export * from './plaster-drying'
export * from './plaster-cutlist'
export * from './plaster-units'
export * from './plaster-fibrous'

/** Strength–porosity exponent n in σ ∝ (1 − p)^n: 3, mid of the 2.5–3.5 Sattler (ZKG Int. 50, 1997) reports. */
export const STRENGTH_POROSITY_EXPONENT = 3

/** Wet (green) strength ≈ half the dry strength (common practice; Gypsum & Lime vol. 13, 1954, found the same). */
export const WET_TO_DRY_STRENGTH_RATIO = 0.5

/**
 * Burn caution: an adiabatic peak of 45 °C or more (skin damage can start at 45 °C with prolonged
 * contact: NSEAD, "A guide to safe practice in art and design", 7.12 Plaster of Paris) in a gauge of
 * 5 kg of slurry or more. Below a few kilograms a bowl or thin cast sheds its heat to the mould
 * and air and stays warm rather than hot (the 5 kg is common practice, a shop judgement).
 */
export const BURN_CAUTION = { peakC: 45, slurryKg: 5 } as const

/** Water boils at 100 °C at sea level: the peak-temperature bound is capped there (definition of the Celsius scale's old fixed point). */
export const PLASTER_BOILING_C = 100

/** What `batchForCavity` returns. slurryDensity in kg/L. */
export interface PlasterBatch {
  plasterKg: number
  waterKg: number
  slurryKg: number
  slurryLitres: number
  slurryDensity: number
}

/** What `castFromBatch` returns: the set cast, all masses kg, dryDensity kg/L (= g/cm³). */
export interface PlasterCast {
  dryMassKg: number
  boundWaterKg: number
  freeWaterKg: number
  wetMassKg: number
  porosity: number
  dryDensity: number
}

/**
 * Plaster and water to fill `cavityLitres`, plus `wastePct` for bowl and strike-off waste.
 * Per kg of powder the slurry takes 1/ρ_powder + c/100 litres (water 1.00 kg/L, no entrained
 * air), so plasterKg = cavity × (1 + waste/100) / (1/ρ_powder + c/100); waterKg = plasterKg × c/100.
 * 1 L of beta (2.63) at 70 gives 0.9257 kg plaster, 0.6480 kg water, 1.574 kg/L.
 */
export function batchForCavity(input: {
  cavityLitres: number
  consistency: number
  grade: PlasterGrade
  wastePct?: number
}): PlasterBatch {
  const i = assertPlasterObject(input, 'input')
  const grade = assertPlasterGrade(i.grade)
  const cavity = assertPlasterNumber(i.cavityLitres, 'cavityLitres', PLASTER_LIMITS.cavityLitres)
  const c = assertPlasterConsistency(i.consistency)
  const waste = assertPlasterNumber(i.wastePct ?? 0, 'wastePct', PLASTER_LIMITS.wastePct)
  const slurryLitres = cavity * (1 + waste / 100)
  const plasterKg = slurryLitres / (1 / grade.powderDensity + c / 100 / MIX_WATER_DENSITY)
  const waterKg = (plasterKg * c) / 100
  const slurryKg = plasterKg + waterKg
  return { plasterKg, waterKg, slurryKg, slurryLitres, slurryDensity: slurryKg / slurryLitres }
}

/**
 * The set cast of a batch. The set body keeps the paste's outer volume (the ≈0.2 % setting
 * expansion is ignored for mass). Hemihydrate binds 0.18618 kg water per kg (IUPAC atomic
 * weights); boundWater = plaster × purity × 0.18618 (or all the water, if less);
 * dryMass = plaster + boundWater (= plaster × purity × 172.164/145.142 + plaster × (1 − purity));
 * freeWater = water − boundWater; porosity = 1 − (dryMass / 2.32) / slurry volume;
 * dryDensity = dryMass / slurry volume.
 */
export function castFromBatch(input: { plasterKg: number; waterKg: number; grade: PlasterGrade }): PlasterCast {
  const i = assertPlasterObject(input, 'input')
  const grade = assertPlasterGrade(i.grade)
  const plasterKg = assertPlasterNumber(i.plasterKg, 'plasterKg', PLASTER_LIMITS.plasterKg)
  const waterKg = assertPlasterNumber(i.waterKg, 'waterKg', PLASTER_LIMITS.waterKg)
  const { min, max } = PLASTER_LIMITS.consistency
  const c = (100 * waterKg) / plasterKg
  if (c < min || c > max) {
    throw new PlasterInputError('waterKg', `waterKg must be between ${min} and ${max} parts per 100 parts plasterKg`)
  }
  const boundWaterKg = Math.min(waterKg, plasterKg * grade.purity * HYDRATION_WATER_PER_HEMIHYDRATE)
  const dryMassKg = plasterKg + boundWaterKg
  const slurryLitres = plasterKg / grade.powderDensity + waterKg / MIX_WATER_DENSITY
  return {
    dryMassKg,
    boundWaterKg,
    freeWaterKg: waterKg - boundWaterKg,
    wetMassKg: plasterKg + waterKg,
    porosity: 1 - dryMassKg / GYPSUM_DENSITY / slurryLitres,
    dryDensity: dryMassKg / slurryLitres,
  }
}

/**
 * Slurry temperature, °C, just after mixing: heat balance of the water (4.18 J/g·K) and the powder
 * (hemihydrate ≈ 0.82 J/g·K), each at its own temperature; mixing work and early hydration heat
 * are ignored. T = (m_w c_w T_w + m_p c_p T_p) / (m_w c_w + m_p c_p).
 */
export function slurryTemperature(input: {
  plasterKg: number
  waterKg: number
  waterTempC: number
  powderTempC: number
}): number {
  const i = assertPlasterObject(input, 'input')
  const plaster = assertPlasterNumber(i.plasterKg, 'plasterKg', PLASTER_LIMITS.plasterKg)
  const water = assertPlasterNumber(i.waterKg, 'waterKg', PLASTER_LIMITS.waterKg)
  const tw = assertPlasterNumber(i.waterTempC, 'waterTempC', PLASTER_LIMITS.waterTempC)
  const tp = assertPlasterNumber(i.powderTempC, 'powderTempC', PLASTER_LIMITS.powderTempC)
  const cw = water * WATER_SPECIFIC_HEAT
  const cp = plaster * HEMIHYDRATE_SPECIFIC_HEAT
  const t = (cw * tw + cp * tp) / (cw + cp)
  // the slurry is never a field anyone typed: name the ones they did
  if (t < PLASTER_LIMITS.slurryTempC.min) {
    throw new PlasterInputError('powderTempC', `With water at ${tw} °C and powder at ${tp} °C the mix would be at ${t.toFixed(1)} °C and freeze: warm the water or bring the powder indoors.`)
  }
  return t
}

/**
 * Strength at `consistency` relative to `refConsistency` (default: the grade's default):
 * σ/σ_ref = ((1 − p) / (1 − p_ref))^n with porosities from castFromBatch and n = 3 (Sattler,
 * ZKG Int. 50 (1997) 54, n = 2.5–3.5; `exponent` may pick another, 1–6). Beta 60 vs 80 ≈ 1.75.
 * Absolute strength needs the grade's own tested value at its reference consistency.
 */
export function relativeStrength(input: {
  grade: PlasterGrade
  consistency: number
  refConsistency?: number
  exponent?: number
}): number {
  const i = assertPlasterObject(input, 'input')
  const grade = assertPlasterGrade(i.grade)
  const c = assertPlasterConsistency(i.consistency)
  const ref = assertPlasterConsistency(i.refConsistency ?? grade.consistency.default, 'refConsistency')
  const n = assertPlasterNumber(i.exponent ?? STRENGTH_POROSITY_EXPONENT, 'exponent', PLASTER_LIMITS.strengthExponent)
  const solid = (consistency: number) => 1 - castFromBatch({ plasterKg: 1, waterKg: consistency / 100, grade }).porosity
  return (solid(c) / solid(ref)) ** n
}

/** Input of `mixSummary` (the zod schema `mixInputSchema` in plaster-schema.ts checks it at the edge). */
export interface PlasterMixInput {
  cavityLitres: number
  grade: PlasterGrade
  consistency: number
  wastePct: number
  waterTempC: number
  powderTempC: number
  shopTempC: number
  setFactor: number
  maxDwellMinutes: number
}

/** Everything the mix card shows. `cast` is the part that fills the cavity (waste excluded). */
export interface PlasterMixSummary {
  batch: PlasterBatch
  slurryTempC: number
  window: PlasterDemouldWindow
  cast: PlasterCast
  /** strength relative to the grade at its default consistency */
  relativeStrength: number
  /** the consistency is outside the grade's range: the strength figure is an extrapolation */
  strengthExtrapolated: boolean
  adiabaticRiseC: number
  /** slurry temperature + adiabatic rise: an upper bound of the set's peak, °C */
  peakTempUpperBoundC: number
  burnCaution: boolean
  setCurve: PlasterSetPoint[]
  /** the window's warnings plus shop and burn notes */
  warnings: string[]
}

/** The mix card's user typed the water temperature, not the slurry's: a too-hot slurry names the water. */
function namingWaterTemp<T>(fn: () => T): T {
  try {
    return fn()
  }
  catch (e) {
    if (e instanceof PlasterInputError && e.field === 'slurryTempC') throw new PlasterInputError('waterTempC', e.message)
    throw e
  }
}

/** Curve span: 1.5 × the demould-ready time, where hydration is past 0.99, in about 120 steps. */
function curveSpan(openMinutes: number): { untilMinutes: number; stepMinutes: number } {
  const untilMinutes = Math.min(PLASTER_LIMITS.untilMinutes.max, Math.max(1, Math.ceil(openMinutes * 1.5)))
  return { untilMinutes, stepMinutes: Math.max(1, Math.ceil(untilMinutes / 120)) }
}

/**
 * The mix card in one call (used by the UI and POST /api/calc/mix): batch for the cavity with
 * waste, slurry temperature from the heat balance, the demould window at that temperature, the
 * cast, strength relative to the grade's default consistency, adiabatic rise, burn caution and
 * the set curve. shopTempC only adds warnings: the set follows the slurry's temperature.
 */
export function mixSummary(input: PlasterMixInput): PlasterMixSummary {
  const i = assertPlasterObject(input, 'input')
  const grade = assertPlasterGrade(i.grade)
  const consistency = assertPlasterConsistency(i.consistency)
  const shopC = assertPlasterNumber(i.shopTempC, 'shopTempC', PLASTER_LIMITS.shopTempC)
  const batch = batchForCavity({ cavityLitres: input.cavityLitres, consistency, grade, wastePct: input.wastePct })
  const slurryTempC = slurryTemperature({ ...batch, waterTempC: input.waterTempC, powderTempC: input.powderTempC })
  const setFactor = input.setFactor
  const window = namingWaterTemp(() => demouldWindow({ grade, consistency, slurryTempC, setFactor, maxDwellMinutes: input.maxDwellMinutes }))
  const share = 1 / (1 + (input.wastePct ?? 0) / 100)
  const cast = castFromBatch({ plasterKg: batch.plasterKg * share, waterKg: batch.waterKg * share, grade })
  const rise = adiabaticRiseC({ grade, consistency })
  // water boils at 100 °C (sea level): the bound never claims more, whatever the sum
  const peak = Math.min(PLASTER_BOILING_C, slurryTempC + rise)
  const burnCaution = peak >= BURN_CAUTION.peakC && batch.slurryKg >= BURN_CAUTION.slurryKg
  const warnings = [...window.warnings]
  if (shopC < 5) warnings.push(`Shop at ${shopC} °C: keep casts well above freezing through the set; a cold mould slows it further.`)
  if (burnCaution) {
    warnings.push(`Setting plaster can reach about ${Math.round(peak)} °C: never embed hands or skin in the mix.`)
  }
  const strength = relativeStrength({ grade, consistency })
  const strengthExtrapolated = consistency < grade.consistency.min || consistency > grade.consistency.max
  if (strengthExtrapolated) {
    warnings.push(`Strength × ${strength.toFixed(2)} is an extrapolation: consistency ${consistency} is outside this grade's range ${grade.consistency.min}–${grade.consistency.max}, where the porosity law holds; test a cube before relying on it.`)
  }
  return {
    batch,
    slurryTempC,
    window,
    cast,
    relativeStrength: strength,
    strengthExtrapolated,
    adiabaticRiseC: rise,
    peakTempUpperBoundC: peak,
    burnCaution,
    setCurve: setCurve({ grade, consistency, slurryTempC, setFactor, ...curveSpan(window.openMinutes) }),
    warnings,
  }
}
