/**
 * Drying: saturation vapour pressure, wet-bulb temperature, the constant-rate drying estimate,
 * the over-temperature guard and dryness by weight. Re-exported from `plaster.ts`. Pure.
 *
 * Sources: evaporation from a wet surface per the equation of the ASHRAE Handbook—HVAC
 * Applications, natatorium (indoor swimming pool) section: w = A (p_w − p_a)(0.089 + 0.0782 V) / Y × F_a,
 * with the activity factor F_a = 0.5 the chapter gives for still, unoccupied water (a residential
 * pool at rest); a wet cast on a rack is still water with no one splashing it. Saturation vapour
 * pressure: Buck's equation with the constants of his 1996 revision (A. L. Buck, hygrometer
 * user's manual, 1996, appendix 1; the 1981 paper, J. Appl. Meteor. 20: 1527, gave the earlier
 * constants). Wet bulb: Stull 2011. Constant weight as the dry test: common practice (below).
 * Caution: drying rooms run warm and heavy wet casts are handled on racks; follow local codes
 * and competent practice for heaters, ventilation and lifting.
 */
import { PLASTER_LIMITS, PlasterInputError, assertPlasterNumber, assertPlasterObject } from './plaster-core'

/**
 * Ceiling for drying casts and moulds: 49 °C (120 °F), the limit the plaster trade has long
 * kept for drying moulds and casts (common practice; no standard sets it). Set gypsum loses
 * combined water well below boiling: in water it is metastable against anhydrite above 42.5 °C
 * (Can. J. Chem. 62 (1984), doi:10.1139/v84-081, "Thermodynamics of solution of gypsum and
 * anhydrite in water over a wide temperature range"), though that change is slow; in very dry
 * air even 40 °C removes bound water (ASHRAE 2004, "Effect of drying protocols on measurement
 * of sorption isotherms of gypsum building materials").
 */
export const PLASTER_DRYING_MAX_C = 49

/**
 * Within 0.5 % free water of its computed dry mass (common practice, no source). Only a guide
 * now: the computed dry mass is good to about 2 % (dryMassGuide), so the dry test is constant
 * weight (constantWeight).
 */
export const PLASTER_DRY_FREE_WATER_PCT = 0.5

/**
 * Default multiplier for the slow, falling-rate end of drying: 1, i.e. no allowance, used until
 * the shop has weighed at least PLASTER_FALLING_RATE_MIN_PIECES pieces to constant weight
 * (fallingRateFromWeighings). This default is our choice, neither sourced nor common practice:
 * we know of no published factor for cast gypsum, and the model once used an unsourced 2 that
 * happened to cancel the missing activity factor. With 1 the dry-by date errs early, which is
 * the harmless side, because the weighings (constant weight), never the date, decide dry.
 */
export const PLASTER_FALLING_RATE_FACTOR = 1

/**
 * Pieces weighed to constant weight the shop needs before its own falling-rate factor replaces
 * the default: 5 (our choice; a median of fewer pieces moves too much with one odd rack).
 */
export const PLASTER_FALLING_RATE_MIN_PIECES = 5

/** Activity factor of still, unoccupied water: 0.5 (ASHRAE Handbook—HVAC Applications, natatorium section). */
export const PLASTER_EVAPORATION_ACTIVITY = 0.5

/** At or above this relative humidity the estimate says the cast will not dry (the vapour gap is within the formulas' error). */
export const PLASTER_NO_DRYING_RH = 99.9

/** Below about 5 °C a wet cast can freeze overnight near cold walls and floors (common practice). */
export const PLASTER_FREEZE_WARN_C = 5

/** Stull 2011 is fitted for 5–99 % RH; outside it the wet bulb is taken at the nearest edge. */
const STULL_RH = { min: 5, max: 99 }

/**
 * Saturation vapour pressure over liquid water, kPa, at `tempC` (−40 to 100 °C): Buck's
 * equation with his 1996 constants (Buck 1996 user's manual, appendix 1; the 1981 paper had
 * 18.729, 227.3 and 257.87 in their place, recalled from memory):
 * e = 0.61121 exp((18.678 − T/234.5) × T / (257.14 + T)). Within 0.04 % of the IAPWS-95 values
 * tabulated in the CRC Handbook from 0 to 50 °C, and 101.31 kPa at 100 °C. Below 0 °C it is the
 * value over supercooled water, not ice.
 */
export function saturationVapourPressureKPa(tempC: number): number {
  const t = assertPlasterNumber(tempC, 'tempC', PLASTER_LIMITS.tempC)
  return 0.61121 * Math.exp((18.678 - t / 234.5) * (t / (257.14 + t)))
}

function stull(t: number, rh: number): number {
  return t * Math.atan(0.151977 * Math.sqrt(rh + 8.313659))
    + Math.atan(t + rh) - Math.atan(rh - 1.676331)
    + 0.00391838 * rh ** 1.5 * Math.atan(0.023101 * rh)
    - 4.686035
}

/**
 * Wet-bulb temperature, °C, at sea-level pressure: Stull, "Wet-bulb temperature from relative
 * humidity and air temperature", J. Appl. Meteor. Climatol. 50 (2011) 2267, fitted for
 * −20–50 °C and 5–99 % RH (about ±0.3 °C). Choice for the RH edges: throw outside 0–100 %
 * (impossible) and outside −20–50 °C; below 5 % use 5 % (slightly high, so drying is
 * under- rather than over-estimated); from 99 % to 100 % blend linearly to the air temperature,
 * which is exact at saturation. Never above the air temperature.
 */
export function wetBulbC(tempC: number, relHumidityPct: number): number {
  const t = assertPlasterNumber(tempC, 'tempC', PLASTER_LIMITS.airTempC)
  const rh = assertPlasterNumber(relHumidityPct, 'relHumidityPct', PLASTER_LIMITS.relHumidityPct)
  const atEdge = stull(t, Math.min(Math.max(rh, STULL_RH.min), STULL_RH.max))
  const tw = rh <= STULL_RH.max ? atEdge : atEdge + ((t - atEdge) * (rh - STULL_RH.max)) / (100 - STULL_RH.max)
  return Math.min(tw, t)
}

/**
 * The section a cast is taken to have when only its volume is known: 25 mm, within the
 * 20–30 mm that solid cast ornament is commonly made (common practice, no source; fibrous
 * work is thinner and dries sooner, a solid corbel thicker and later).
 */
export const PLASTER_CAST_THICKNESS_MM = 25

/**
 * Exposed area of a cast known only by its volume, m²: a shell of the given section with both
 * faces drying (racked off the floor, as drying racks hold casts), edges ignored:
 * A = 2 × V / t. An estimate for `dryingEstimate`'s area, no more: the weighing decides dry.
 */
export function castExposedAreaM2(input: { volumeLitres: number; thicknessMm?: number }): number {
  const i = assertPlasterObject(input, 'input')
  const litres = assertPlasterNumber(i.volumeLitres, 'volumeLitres', PLASTER_LIMITS.cavityLitres)
  const mm = assertPlasterNumber(i.thicknessMm ?? PLASTER_CAST_THICKNESS_MM, 'thicknessMm', PLASTER_LIMITS.castThicknessMm)
  return (2 * litres / 1000) / (mm / 1000)
}

/** Result of `dryingEstimate`. */
export interface PlasterDryingEstimate {
  /** kg of water per hour evaporating from the wet surface in the constant-rate period */
  constantRateKgPerHour: number
  /** hours to remove the free water: free water / rate × fallingRateFactor; Infinity in saturated air */
  hours: number
  /** the wet surface's temperature, °C */
  wetBulbC: number
  warnings: string[]
}

/**
 * Drying time, hours. In the constant-rate period the wet surface sits at the air's wet-bulb
 * temperature (Stull 2011) and evaporates per Carrier's equation as given in the ASHRAE Handbook
 * (HVAC Applications, natatoriums): kg/s = A × (p_s − p_a) × (0.089 + 0.0782 V) / Y × F_a, with A
 * in m², p_s the saturation pressure at the surface and p_a the air's vapour pressure in kPa
 * (Buck), V air speed m/s, Y = 2501 − 2.361 T kJ/kg the latent heat at the surface temperature T
 * and F_a = 0.5 the activity factor for still, unoccupied water (same chapter).
 * hours = freeWater / rate × fallingRateFactor (default 1; the shop's from its weighings,
 * fallingRateFromWeighings). At 99.9 % RH and above: Infinity, "will not dry in these conditions".
 */
export function dryingEstimate(input: {
  freeWaterKg: number
  exposedAreaM2: number
  airTempC: number
  relHumidityPct: number
  airSpeedMs: number
  fallingRateFactor?: number
}): PlasterDryingEstimate {
  const i = assertPlasterObject(input, 'input')
  const L = PLASTER_LIMITS
  const water = assertPlasterNumber(i.freeWaterKg, 'freeWaterKg', L.freeWaterKg)
  const area = assertPlasterNumber(i.exposedAreaM2, 'exposedAreaM2', L.exposedAreaM2)
  const airT = assertPlasterNumber(i.airTempC, 'airTempC', L.airTempC)
  const rh = assertPlasterNumber(i.relHumidityPct, 'relHumidityPct', L.relHumidityPct)
  const v = assertPlasterNumber(i.airSpeedMs, 'airSpeedMs', L.airSpeedMs)
  const falling = assertPlasterNumber(i.fallingRateFactor ?? PLASTER_FALLING_RATE_FACTOR, 'fallingRateFactor', L.fallingRateFactor)
  const surfaceC = wetBulbC(airT, rh)
  const dp = saturationVapourPressureKPa(surfaceC) - (rh / 100) * saturationVapourPressureKPa(airT)
  const latent = 2501 - 2.361 * surfaceC
  const saturated = rh >= PLASTER_NO_DRYING_RH
  const kgPerHour = saturated ? 0 : Math.max(0, (area * dp * (0.089 + 0.0782 * v) * PLASTER_EVAPORATION_ACTIVITY) / latent) * 3600
  const warnings: string[] = []
  if (rh < STULL_RH.min || rh > STULL_RH.max) {
    warnings.push(`Relative humidity ${rh} % is outside 5–99 %, the range of the wet-bulb formula; the estimate is rougher.`)
  }
  const guard = dryingGuard(airT)
  if (guard) warnings.push(guard)
  if (airT < PLASTER_FREEZE_WARN_C && water > 0) {
    warnings.push(`At ${airT} °C a wet cast can freeze, and ice in it spoils the surface and can crack it: keep wet casts above ${PLASTER_FREEZE_WARN_C} °C.`)
  }
  if (kgPerHour === 0 && water > 0) warnings.push('The air is saturated: the cast will not dry in these conditions; it needs drier or warmer air.')
  const hours = water === 0 ? 0 : kgPerHour === 0 ? Infinity : (water / kgPerHour) * falling
  return { constantRateKgPerHour: kgPerHour, hours, wetBulbC: surfaceC, warnings }
}

/**
 * Warning text when a cast or drying room is set above 49 °C, else null: set gypsum starts to
 * lose its combined water well below boiling, and a cast dried hot goes soft and chalky.
 */
export function dryingGuard(tempC: number): string | null {
  if (typeof tempC !== 'number' || !Number.isFinite(tempC)) {
    throw new PlasterInputError('tempC', 'tempC must be a finite number (°C)')
  }
  if (tempC <= PLASTER_DRYING_MAX_C) return null
  return `${tempC} °C is above ${PLASTER_DRYING_MAX_C} °C: set plaster starts to lose its combined water and goes soft and chalky; dry at ${PLASTER_DRYING_MAX_C} °C or below.`
}

/**
 * Dryness by weight: free water left = weighed − computed dry mass, kg, and as % of the dry mass.
 * Dry when within 0.5 % (common practice; the trade's own test is constant weight between
 * weighings). A piece lighter than its dry mass gives a negative figure and a warning.
 */
export function dryness(input: { weighedKg: number; dryMassKg: number }): {
  freeWaterKg: number
  freeWaterPct: number
  isDry: boolean
  warnings: string[]
} {
  const i = assertPlasterObject(input, 'input')
  const weighed = assertPlasterNumber(i.weighedKg, 'weighedKg', PLASTER_LIMITS.weighedKg)
  const dry = assertPlasterNumber(i.dryMassKg, 'dryMassKg', PLASTER_LIMITS.dryMassKg)
  const freeWaterKg = weighed - dry
  const freeWaterPct = (freeWaterKg / dry) * 100
  const warnings = freeWaterPct < -PLASTER_DRY_FREE_WATER_PCT
    ? ['The piece weighs less than its computed dry mass: check the dry mass, or the piece may have been over-dried and lost combined water.']
    : []
  return { freeWaterKg, freeWaterPct, isDry: freeWaterPct <= PLASTER_DRY_FREE_WATER_PCT, warnings }
}

/** Where a falling-rate factor came from: the shop's own pieces, or the default for want of them. */
export interface PlasterFallingRate {
  factor: number
  /** usable pieces behind the fit (may be fewer than the minimum when the default is used) */
  count: number
  source: 'shop' | 'default'
}

/**
 * The shop's falling-rate factor from its own weighings: per piece that reached constant weight,
 * the hours it actually took ÷ the constant-rate estimate for it (dryingEstimate with factor 1),
 * and their median (robust to a piece forgotten on the rack). Never below 1 (drying does not
 * outrun the constant rate) nor above the limit. With fewer than PLASTER_FALLING_RATE_MIN_PIECES
 * usable pieces: the default (1), and says so.
 */
export function fallingRateFromWeighings(pieces: { estimatedHours: number; actualHours: number }[]): PlasterFallingRate {
  if (!Array.isArray(pieces)) throw new PlasterInputError('pieces', 'pieces must be an array')
  const ratios = pieces.filter(p => typeof p === 'object' && p !== null && Number.isFinite(p.estimatedHours) && Number.isFinite(p.actualHours)
    && p.estimatedHours > 0 && p.actualHours > 0).map(p => p.actualHours / p.estimatedHours).sort((a, b) => a - b)
  if (ratios.length < PLASTER_FALLING_RATE_MIN_PIECES) return { factor: PLASTER_FALLING_RATE_FACTOR, count: ratios.length, source: 'default' }
  const mid = ratios.length >> 1
  const median = ratios.length % 2 ? ratios[mid]! : (ratios[mid - 1]! + ratios[mid]!) / 2
  const { min, max } = PLASTER_LIMITS.fallingRateFactor
  return { factor: Math.min(max, Math.max(min, median)), count: ratios.length, source: 'shop' }
}

/** How a screen says which falling-rate factor a dry-by date used. */
export function fallingRateNote(r: PlasterFallingRate): string {
  return r.source === 'shop'
    ? `drying time × ${r.factor.toFixed(2)} from ${r.count} of the shop's pieces weighed to constant weight`
    : `no allowance yet for the slow end of drying (${r.count} of ${PLASTER_FALLING_RATE_MIN_PIECES} pieces weighed to constant weight so far): the date may be early, the weighings decide`
}

/**
 * Dry by constant weight, the trade's own test (common practice; the figures are this model's
 * choice): two weighings at least 24 hours apart that differ by no more than 0.1 % of the later
 * one, or 2 g, whichever is more. Why these: free water leaves a cast ever more slowly, so once
 * a day in the drying room takes off no more than 0.1 % (1 g per kg; a fresh cast holds some
 * 250–400 g of free water per kg of plaster, from the gauging water) the cast is as dry as that
 * room will make it; a day apart, because the slow end of drying hides inside a shorter gap;
 * 2 g as a floor, because a bench scale reading in 1 g steps can differ by a step or two on the
 * same piece, so a 1 kg rosette could otherwise never pass. A gain beyond the tolerance (damp
 * air) is not constant either. The computed dry mass is only a guide (dryMassGuide).
 */
export const PLASTER_CONSTANT_WEIGHT = { minHoursApart: 24, tolerancePct: 0.1, toleranceMinKg: 0.002 } as const

/** Result of `constantWeight`: `changePct` is (earlier − later) ÷ later × 100 of the pair compared. */
export interface PlasterConstantWeight {
  isDry: boolean
  changePct: number | null
  hoursApart: number | null
  message: string
}

const HOUR_MS = 3_600_000

function weighingRows(weighings: { kg: number; at: Date }[]) {
  if (!Array.isArray(weighings)) throw new PlasterInputError('weighings', 'weighings must be an array')
  return weighings.map((w, n) => {
    const o = assertPlasterObject(w, `weighings[${n}]`)
    const kg = assertPlasterNumber(o.kg, `weighings[${n}].kg`, PLASTER_LIMITS.weighedKg)
    if (!(o.at instanceof Date) || Number.isNaN(o.at.getTime())) throw new PlasterInputError(`weighings[${n}].at`, `weighings[${n}].at must be a time`)
    return { kg, at: o.at.getTime() }
  }).sort((a, b) => a.at - b.at)
}

/** The pair's change, and whether it is within the tolerance (0.1 % of the later, at least 2 g). */
function pairHolds(earlier: { kg: number }, later: { kg: number }) {
  const { tolerancePct, toleranceMinKg } = PLASTER_CONSTANT_WEIGHT
  const changeKg = earlier.kg - later.kg
  const allowedKg = Math.max((later.kg * tolerancePct) / 100, toleranceMinKg)
  return { changePct: (changeKg / later.kg) * 100, holds: Math.abs(changeKg) <= allowedKg + 1e-12 }
}

const RULE = `dry is a change of ${PLASTER_CONSTANT_WEIGHT.tolerancePct} % or less (at least ${PLASTER_CONSTANT_WEIGHT.toleranceMinKg * 1000} g allowed) over at least ${PLASTER_CONSTANT_WEIGHT.minHoursApart} h`

/**
 * Constant weight over a piece's weighings in one drying spell (any order): the latest weighing
 * against the latest one at least `minHoursApart` before it. The message says what is missing.
 */
export function constantWeight(weighings: { kg: number; at: Date }[]): PlasterConstantWeight {
  const rows = weighingRows(weighings)
  const { minHoursApart } = PLASTER_CONSTANT_WEIGHT
  const last = rows.at(-1)
  if (!last) return { isDry: false, changePct: null, hoursApart: null, message: 'Not weighed yet since it went to drying: weigh it, then again at least a day later.' }
  const earlier = [...rows].reverse().find(r => last.at - r.at >= minHoursApart * HOUR_MS)
  if (!earlier) {
    const first = rows[0]!
    const so = rows.length === 1 ? 'weighed once so far' : `weighed ${rows.length} times, the first ${Math.round((last.at - first.at) / HOUR_MS)} h before the last`
    return {
      isDry: false, changePct: null, hoursApart: null,
      message: `Needs a second weighing at least ${minHoursApart} hours after an earlier one (${so}) to show constant weight.`,
    }
  }
  const { changePct, holds } = pairHolds(earlier, last)
  const hoursApart = (last.at - earlier.at) / HOUR_MS
  const message = holds
    ? `Constant weight: ${changePct.toFixed(2)} % change over ${Math.round(hoursApart)} h (${RULE}).`
    : `Still changing: ${changePct.toFixed(2)} % over ${Math.round(hoursApart)} h (${RULE}); weigh it again later.`
  return { isDry: holds, changePct, hoursApart, message }
}

/**
 * When a piece was first shown at constant weight: the earlier weighing of the first pair (at
 * least `minHoursApart` apart, within the tolerance); null when no pair holds. The piece was
 * as dry as the room makes it by then, so this is when drying ended, to the nearest weighing.
 */
export function constantWeightReachedAt(weighings: { kg: number; at: Date }[]): Date | null {
  const rows = weighingRows(weighings)
  for (let i = 0; i < rows.length; i++) {
    for (let j = i + 1; j < rows.length; j++) {
      if (rows[j]!.at - rows[i]!.at >= PLASTER_CONSTANT_WEIGHT.minHoursApart * HOUR_MS && pairHolds(rows[i]!, rows[j]!).holds) return new Date(rows[i]!.at)
    }
  }
  return null
}

/**
 * How far the computed dry mass can be trusted: ±2 %, the match of the model's dry densities to
 * published ones (plaster-mix tests); and it reads high by as much as the caster gauged over the
 * planned batch, since the batch less the usual waste is assumed to be in the cast (10 % over
 * the planned batch: up to 10 % high). A guide beside the weighings, never the gate.
 */
export const PLASTER_DRY_MASS_UNCERTAINTY_PCT = 2

export interface PlasterDryMassGuide { kg: number; lowKg: number; highKg: number; batchExcessPct: number; label: string }

/**
 * The computed dry mass as a range: ±2 %, and, when the batch gauged was `batchExcessPct` over
 * the planned one, the low end divided by (1 + excess) too (the extra may have stayed in the bowl).
 */
export function dryMassGuide(dryMassKg: number, batchExcessPct = 0): PlasterDryMassGuide {
  const kg = assertPlasterNumber(dryMassKg, 'dryMassKg', PLASTER_LIMITS.dryMassKg)
  if (typeof batchExcessPct !== 'number' || !Number.isFinite(batchExcessPct)) throw new PlasterInputError('batchExcessPct', 'batchExcessPct must be a finite number (%)')
  const u = PLASTER_DRY_MASS_UNCERTAINTY_PCT / 100
  const excess = Math.max(0, batchExcessPct) / 100
  const lowKg = (kg * (1 - u)) / (1 + excess)
  const highKg = kg * (1 + u)
  const over = excess > 0 ? `; the batch was ${(excess * 100).toFixed(0)} % over plan, so it may be lower` : ''
  return {
    kg, lowKg, highKg, batchExcessPct: excess * 100,
    label: `about ${kg.toFixed(2)} kg (± ${PLASTER_DRY_MASS_UNCERTAINTY_PCT} %${over}; a guide only, weigh to constant weight)`,
  }
}
