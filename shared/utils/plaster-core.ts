/**
 * Shared core of the plaster model: the grade type, the input error, the physical
 * constants with their sources, and the input checks every plaster function uses.
 *
 * Units everywhere: masses kg, volumes litres, temperatures °C, times minutes,
 * consistency = parts water per 100 parts plaster by mass (70 means water/plaster 0.70).
 * Pure: no I/O and no framework import. Re-exported from `plaster.ts`.
 */

/** Crystal form of the calcium sulfate hemihydrate: β (calcined dry) or α (calcined in steam or brine). */
export type HemihydrateForm = 'beta' | 'alpha'

/** A plaster grade: the numbers the model needs about one kind of powder. */
export interface PlasterGrade {
  form: HemihydrateForm
  /** g/cm³ (= kg/L) of the dry powder particles. */
  powderDensity: number
  /** parts water per 100 parts plaster by mass. */
  consistency: { min: number; max: number; default: number }
  /** minutes from end of mixing to demould-ready, at consistency.default and slurry 20 °C. */
  demouldMinutesRef: number
  /** m in (c / c_ref)^m: how strongly extra water slows the set. */
  setTimeWaterExponent: number
  /** [slurry °C, multiplier on set time], piecewise-linear, ascending, multiplier 1 at 20 °C. */
  temperatureFactors: [number, number][]
  /** J per g of hemihydrate. */
  hydrationHeat: number
  /** linear setting expansion, %. */
  setExpansionPct: number
  /** mass fraction of hemihydrate in the powder, 0..1. */
  purity: number
}

/**
 * Thrown on bad input. `field` names the offending field (dotted path, e.g.
 * `grade.consistency.default` or `walls[2].lengthM`) so a route can answer 422 with it.
 */
export class PlasterInputError extends Error {
  readonly field: string

  constructor(field: string, message: string) {
    super(message)
    this.name = 'PlasterInputError'
    this.field = field
  }
}

/**
 * Standard atomic weights, g/mol: IUPAC/CIAAW abridged standard atomic weights
 * (Ca 40.078, S 32.06, O 15.999, H 1.008).
 */
export const PLASTER_ATOMIC_WEIGHTS = { Ca: 40.078, S: 32.06, O: 15.999, H: 1.008 } as const

const { Ca, S, O, H } = PLASTER_ATOMIC_WEIGHTS
const WATER_MOLAR = 2 * H + O
const ANHYDRITE_MOLAR = Ca + S + 4 * O

/**
 * Molar masses, g/mol, derived from the IUPAC atomic weights above:
 * water 18.015, CaSO4 136.134, CaSO4·½H2O 145.142, CaSO4·2H2O 172.164.
 */
export const PLASTER_MOLAR_MASS = {
  water: WATER_MOLAR,
  anhydrite: ANHYDRITE_MOLAR,
  hemihydrate: ANHYDRITE_MOLAR + 0.5 * WATER_MOLAR,
  gypsum: ANHYDRITE_MOLAR + 2 * WATER_MOLAR,
} as const

/**
 * kg of water one kg of hemihydrate binds when it sets: CaSO4·½H2O + 1.5 H2O → CaSO4·2H2O,
 * so 1.5 × 18.015 / 145.142 = 0.18618 (derived from IUPAC atomic weights).
 */
export const HYDRATION_WATER_PER_HEMIHYDRATE = (1.5 * WATER_MOLAR) / PLASTER_MOLAR_MASS.hemihydrate

/** kg of gypsum one kg of hemihydrate becomes: 172.164 / 145.142 = 1.18618 (derived, IUPAC). */
export const GYPSUM_PER_HEMIHYDRATE = PLASTER_MOLAR_MASS.gypsum / PLASTER_MOLAR_MASS.hemihydrate

/** Smallest consistency that can hydrate all the hemihydrate: 18.618 parts per 100 (derived, IUPAC). */
export const STOICHIOMETRIC_CONSISTENCY = 100 * HYDRATION_WATER_PER_HEMIHYDRATE

/** Mass fraction of combined water in gypsum: 2 × 18.015 / 172.164 = 20.93 % (derived, IUPAC). */
export const GYPSUM_WATER_FRACTION = (2 * WATER_MOLAR) / PLASTER_MOLAR_MASS.gypsum

/**
 * Density of gypsum crystal, g/cm³ = kg/L: 2.32 (handbook tables, e.g. the CRC Handbook's inorganic
 * compounds, recalled from memory; a molar volume of 74.69 cm³/mol gives 2.305).
 */
export const GYPSUM_DENSITY = 2.32

/** Density of mixing water, kg/L: taken as 1.00 (0.998 at 20 °C; the 0.2 % is below the model's accuracy). */
export const MIX_WATER_DENSITY = 1

/** Specific heat of liquid water near 20 °C, J/(g·K): 4.18 (IAPWS-95 gives 4.182; recalled from memory). */
export const WATER_SPECIFIC_HEAT = 4.18

/**
 * Specific heat of calcium sulfate hemihydrate, J/(g·K): 0.82, from Cp ≈ 119.4 J/(mol·K)
 * ÷ 145.142 g/mol (the Cp is recalled from memory, unverified).
 */
export const HEMIHYDRATE_SPECIFIC_HEAT = 0.82

/** Specific heat of gypsum, J/(g·K): Cp 186.20 J/(mol·K) (Thermoddem database, BRGM) ÷ 172.164 g/mol = 1.0815. */
export const GYPSUM_SPECIFIC_HEAT = 186.2 / PLASTER_MOLAR_MASS.gypsum

/** The thermochemical calorie, J (exact by definition). */
const THERMOCHEMICAL_CALORIE = 4.184

/**
 * Heat of hydration, J per g of hemihydrate, at 25 °C: Southard, "Heat of hydration of calcium
 * sulfates", Ind. Eng. Chem. 32 (1940) 442: β −4600 cal/mol → 132.6 J/g, α −4100 cal/mol → 118.2 J/g.
 */
export const SOUTHARD_HYDRATION_HEAT = {
  beta: (4600 * THERMOCHEMICAL_CALORIE) / PLASTER_MOLAR_MASS.hemihydrate,
  alpha: (4100 * THERMOCHEMICAL_CALORIE) / PLASTER_MOLAR_MASS.hemihydrate,
} as const

/** One allowed range: inclusive `min..max`, or `(min..max]` when `minExclusive`. */
export interface PlasterLimit {
  readonly min: number
  readonly max: number
  readonly unit: string
  readonly minExclusive?: boolean
}

/**
 * Allowed ranges of every input. Physical bounds where physics gives one (consistency below the
 * 18.6 that hydration binds, liquid water 0–99 °C, Stull's fitted −20–50 °C); elsewhere generous
 * sanity bounds (common practice) that only keep absurd numbers out.
 */
export const PLASTER_LIMITS = {
  consistency: { min: 18.6, max: 200, unit: 'parts water per 100 parts plaster' },
  cavityLitres: { min: 0, max: 1000, unit: 'L', minExclusive: true },
  wastePct: { min: 0, max: 100, unit: '%' },
  plasterKg: { min: 0, max: 10000, unit: 'kg', minExclusive: true },
  waterKg: { min: 0, max: 20000, unit: 'kg', minExclusive: true },
  waterTempC: { min: 0, max: 99, unit: '°C, liquid water' },
  powderTempC: { min: -20, max: 60, unit: '°C' },
  slurryTempC: { min: 0, max: 99, unit: '°C, liquid slurry' },
  shopTempC: { min: -20, max: 50, unit: '°C' },
  setFactor: { min: 0, max: 10, unit: 'multiplier on set time', minExclusive: true },
  maxDwellMinutes: { min: 0, max: 10080, unit: 'min' },
  stepMinutes: { min: 0, max: 1440, unit: 'min', minExclusive: true },
  untilMinutes: { min: 0, max: 10080, unit: 'min', minExclusive: true },
  powderDensity: { min: 2.3, max: 3, unit: 'g/cm³' },
  demouldMinutesRef: { min: 0, max: 1440, unit: 'min', minExclusive: true },
  setTimeWaterExponent: { min: 0, max: 5, unit: 'exponent' },
  temperatureFactorTempC: { min: -20, max: 99, unit: '°C' },
  temperatureFactor: { min: 0, max: 20, unit: 'multiplier on set time', minExclusive: true },
  hydrationHeat: { min: 50, max: 300, unit: 'J per g hemihydrate' },
  setExpansionPct: { min: 0, max: 2, unit: '%' },
  purity: { min: 0.5, max: 1, unit: 'mass fraction' },
  strengthExponent: { min: 1, max: 6, unit: 'exponent' },
  tempC: { min: -40, max: 100, unit: '°C' },
  airTempC: { min: -20, max: 50, unit: '°C, the range of Stull 2011' },
  relHumidityPct: { min: 0, max: 100, unit: '%' },
  freeWaterKg: { min: 0, max: 10000, unit: 'kg' },
  exposedAreaM2: { min: 0, max: 10000, unit: 'm²', minExclusive: true },
  airSpeedMs: { min: 0, max: 20, unit: 'm/s' },
  fallingRateFactor: { min: 1, max: 20, unit: 'multiplier on drying time' },
  weighedKg: { min: 0, max: 10000, unit: 'kg', minExclusive: true },
  dryMassKg: { min: 0, max: 10000, unit: 'kg', minExclusive: true },
  castThicknessMm: { min: 0, max: 500, unit: 'mm', minExclusive: true },
  castLengthM: { min: 0, max: 20, unit: 'm', minExclusive: true },
  minPieceM: { min: 0, max: 20, unit: 'm' },
  projectionM: { min: 0, max: 2, unit: 'm', minExclusive: true },
  cornerBlockLegM: { min: 0, max: 2, unit: 'm', minExclusive: true },
  sawCutM: { min: 0, max: 0.05, unit: 'm' },
  wallLengthM: { min: 0, max: 1000, unit: 'm', minExclusive: true },
  sparesPct: { min: 0, max: 100, unit: '%' },
  kg: { min: 0, max: 1e6, unit: 'kg' },
  bagKg: { min: 0, max: 1000, unit: 'kg', minExclusive: true },
} as const satisfies Record<string, PlasterLimit>

/** The message for a value outside `limit`, e.g. "consistency must be between 18.6 and 200 (parts water per 100 parts plaster)". */
export function plasterRangeMessage(field: string, limit: PlasterLimit): string {
  const range = limit.minExclusive
    ? `greater than ${limit.min} and at most ${limit.max}`
    : `between ${limit.min} and ${limit.max}`
  return `${field} must be ${range} (${limit.unit})`
}

/** Returns `value` when it is a finite number inside `limit`; throws PlasterInputError naming `field` otherwise. */
export function assertPlasterNumber(value: unknown, field: string, limit: PlasterLimit): number {
  const ok = typeof value === 'number' && Number.isFinite(value)
    && (limit.minExclusive ? value > limit.min : value >= limit.min) && value <= limit.max
  if (!ok) throw new PlasterInputError(field, plasterRangeMessage(field, limit))
  return value as number
}

/** Throws PlasterInputError unless `value` is a plain object; used for the top-level input of each function. */
export function assertPlasterObject(value: unknown, field: string): Record<string, unknown> {
  if (typeof value !== 'object' || value === null || Array.isArray(value)) {
    throw new PlasterInputError(field, `${field} must be an object`)
  }
  return value as Record<string, unknown>
}

/**
 * Set-time multiplier at `tempC` from a grade's table: piecewise-linear between points and flat
 * beyond the first and last point (the model does not extrapolate a trend it has no data for).
 */
export function interpolateTemperatureFactor(table: readonly (readonly [number, number])[], tempC: number): number {
  const first = table[0]!
  const last = table[table.length - 1]!
  if (tempC <= first[0]) return first[1]
  if (tempC >= last[0]) return last[1]
  let i = 1
  while (table[i]![0] < tempC) i++
  const [t0, f0] = table[i - 1]!
  const [t1, f1] = table[i]!
  return f0 + ((f1 - f0) * (tempC - t0)) / (t1 - t0)
}

function assertTemperatureFactors(value: unknown, field: string): [number, number][] {
  if (!Array.isArray(value) || value.length < 1 || value.length > 50) {
    throw new PlasterInputError(field, `${field} must list 1 to 50 [slurry °C, multiplier] points`)
  }
  const table = value.map((point: unknown, i): [number, number] => {
    if (!Array.isArray(point) || point.length !== 2) {
      throw new PlasterInputError(`${field}[${i}]`, `${field}[${i}] must be a [slurry °C, multiplier] pair`)
    }
    const t = assertPlasterNumber(point[0], `${field}[${i}][0]`, PLASTER_LIMITS.temperatureFactorTempC)
    const f = assertPlasterNumber(point[1], `${field}[${i}][1]`, PLASTER_LIMITS.temperatureFactor)
    return [t, f]
  })
  table.forEach(([t], i) => {
    if (i > 0 && t <= table[i - 1]![0]) {
      throw new PlasterInputError(`${field}[${i}][0]`, `${field} temperatures must be strictly ascending`)
    }
  })
  // The reference time is defined at 20 °C, so the table must leave it unchanged there.
  if (Math.abs(interpolateTemperatureFactor(table, 20) - 1) > 0.001) {
    throw new PlasterInputError(field, `${field} must give a multiplier of 1 at 20 °C`)
  }
  return table
}

function assertGradeConsistency(value: unknown, field: string): PlasterGrade['consistency'] {
  const c = assertPlasterObject(value, field)
  const limit = PLASTER_LIMITS.consistency
  const min = assertPlasterNumber(c.min, `${field}.min`, limit)
  const max = assertPlasterNumber(c.max, `${field}.max`, limit)
  const def = assertPlasterNumber(c.default, `${field}.default`, limit)
  if (min > max) throw new PlasterInputError(`${field}.max`, `${field}.max must not be below ${field}.min`)
  if (def < min || def > max) {
    throw new PlasterInputError(`${field}.default`, `${field}.default must be between ${field}.min and ${field}.max`)
  }
  return { min, max, default: def }
}

/** Checks every field of a grade; returns it typed, or throws PlasterInputError naming the first bad field. */
export function assertPlasterGrade(value: unknown, field = 'grade'): PlasterGrade {
  const g = assertPlasterObject(value, field)
  if (g.form !== 'beta' && g.form !== 'alpha') {
    throw new PlasterInputError(`${field}.form`, `${field}.form must be 'beta' or 'alpha'`)
  }
  const L = PLASTER_LIMITS
  return {
    form: g.form,
    powderDensity: assertPlasterNumber(g.powderDensity, `${field}.powderDensity`, L.powderDensity),
    consistency: assertGradeConsistency(g.consistency, `${field}.consistency`),
    demouldMinutesRef: assertPlasterNumber(g.demouldMinutesRef, `${field}.demouldMinutesRef`, L.demouldMinutesRef),
    setTimeWaterExponent: assertPlasterNumber(g.setTimeWaterExponent, `${field}.setTimeWaterExponent`, L.setTimeWaterExponent),
    temperatureFactors: assertTemperatureFactors(g.temperatureFactors, `${field}.temperatureFactors`),
    hydrationHeat: assertPlasterNumber(g.hydrationHeat, `${field}.hydrationHeat`, L.hydrationHeat),
    setExpansionPct: assertPlasterNumber(g.setExpansionPct, `${field}.setExpansionPct`, L.setExpansionPct),
    purity: assertPlasterNumber(g.purity, `${field}.purity`, L.purity),
  }
}
