// Display units. Setline computes and stores metric (kg, L, °C, m); a workshop may show
// imperial (lb, US gal, °F, in). Conversions are the exact factors of NIST SP 811, from
// plaster-units.ts; these helpers only format and parse for people.
import { cToF, fToC, kgToLb, lbToKg, litresToUsGallons, usGallonsToLitres, LITRES_PER_US_GALLON } from './plaster-units'

export type UnitSystem = 'metric' | 'imperial'

export const UNIT_LABELS: Record<UnitSystem, { mass: string; temp: string; volume: string; length: string; density: string; tempDelta: string; area: string; thickness: string }> = {
  metric: { mass: 'kg', temp: '°C', volume: 'L', length: 'm', density: 'kg/L', tempDelta: 'K', area: 'm²', thickness: 'mm' },
  imperial: { mass: 'lb', temp: '°F', volume: 'US gal', length: 'in', density: 'lb/US gal', tempDelta: '°F', area: 'ft²', thickness: 'in' },
}

export type Quantity = keyof typeof toDisplay

const M_PER_IN = 0.0254
/** m per international foot, exact (NIST SP 811): 0.3048; a square foot is 0.09290304 m². */
export const M_PER_FT = 0.3048

/** A metric value in the display system (numbers, for inputs and charts). */
export const toDisplay = {
  mass: (kg: number, u: UnitSystem) => (u === 'imperial' ? kgToLb(kg) : kg),
  temp: (c: number, u: UnitSystem) => (u === 'imperial' ? cToF(c) : c),
  tempDelta: (dc: number, u: UnitSystem) => (u === 'imperial' ? dc * 1.8 : dc),
  volume: (l: number, u: UnitSystem) => (u === 'imperial' ? litresToUsGallons(l) : l),
  length: (m: number, u: UnitSystem) => (u === 'imperial' ? m / M_PER_IN : m),
  /** kg/L → lb/US gal: (1 / 0.45359237) × 3.785411784 = 8.3454 lb/US gal per kg/L. */
  density: (kgPerL: number, u: UnitSystem) => (u === 'imperial' ? kgToLb(kgPerL) * LITRES_PER_US_GALLON : kgPerL),
  /** m² → ft² (1 ft = 0.3048 m exactly, NIST SP 811) */
  area: (m2: number, u: UnitSystem) => (u === 'imperial' ? m2 / (M_PER_FT * M_PER_FT) : m2),
  /** mm → in (a fibrous shell's thickness) */
  thickness: (mm: number, u: UnitSystem) => (u === 'imperial' ? mm / 25.4 : mm),
}

/** A display-system value back to metric (what an input in °F or lb means). */
export const fromDisplay = {
  mass: (v: number, u: UnitSystem) => (u === 'imperial' ? lbToKg(v) : v),
  temp: (v: number, u: UnitSystem) => (u === 'imperial' ? fToC(v) : v),
  volume: (v: number, u: UnitSystem) => (u === 'imperial' ? usGallonsToLitres(v) : v),
  length: (v: number, u: UnitSystem) => (u === 'imperial' ? v * M_PER_IN : v),
  tempDelta: (v: number, u: UnitSystem) => (u === 'imperial' ? v / 1.8 : v),
  density: (v: number, u: UnitSystem) => (u === 'imperial' ? lbToKg(v) / LITRES_PER_US_GALLON : v),
  area: (v: number, u: UnitSystem) => (u === 'imperial' ? v * M_PER_FT * M_PER_FT : v),
  thickness: (v: number, u: UnitSystem) => (u === 'imperial' ? v * 25.4 : v),
}

function fixed(v: number, digits: number) {
  return Number.isFinite(v) ? v.toFixed(digits) : '—'
}

/** Formatted strings with their unit, e.g. "6.32 kg" or "13.93 lb". */
export const formatUnits = {
  mass: (kg: number, u: UnitSystem, digits = 2) => `${fixed(toDisplay.mass(kg, u), digits)} ${UNIT_LABELS[u].mass}`,
  temp: (c: number, u: UnitSystem, digits = 1) => `${fixed(toDisplay.temp(c, u), digits)} ${UNIT_LABELS[u].temp}`,
  tempDelta: (dc: number, u: UnitSystem, digits = 0) => `${fixed(toDisplay.tempDelta(dc, u), digits)} ${u === 'imperial' ? '°F' : 'K'}`,
  volume: (l: number, u: UnitSystem, digits = 2) => `${fixed(toDisplay.volume(l, u), digits)} ${UNIT_LABELS[u].volume}`,
  length: (m: number, u: UnitSystem, digits = 2) => `${fixed(toDisplay.length(m, u), u === 'imperial' ? 1 : digits)} ${UNIT_LABELS[u].length}`,
  density: (kgPerL: number, u: UnitSystem, digits = 3) => `${fixed(toDisplay.density(kgPerL, u), digits)} ${UNIT_LABELS[u].density}`,
  /** Bags of a given mass, e.g. '2 × 25 kg' or '2 × 55.1 lb'. */
  bags: (count: number, bagKg: number, u: UnitSystem) => `${count} × ${bagMass(bagKg, u)}`,
}

/** A bag's mass as printed on it: whole kilograms, pounds to one decimal unless whole. */
function bagMass(kg: number, u: UnitSystem) {
  const v = toDisplay.mass(kg, u)
  return `${Number.isInteger(Math.round(v * 10) / 10) ? Math.round(v) : v.toFixed(1)} ${UNIT_LABELS[u].mass}`
}

/** The number alone in the display system, for a table column or an input whose label names the unit. */
export function displayNumber(q: Quantity, metric: number, u: UnitSystem, digits = 2): string {
  return fixed(toDisplay[q](metric, u), digits)
}

/** The value to put in an input: display system, rounded to `digits` (no trailing float noise). */
export function inputValue(q: Quantity, metric: number | null | undefined, u: UnitSystem, digits = 2): number | '' {
  if (metric === null || metric === undefined || !Number.isFinite(metric)) return ''
  const f = 10 ** digits
  return Math.round(toDisplay[q](metric, u) * f) / f
}

/** What a number typed in the display system means in metric ('' stays empty). */
export function metricValue(q: keyof typeof fromDisplay, typed: number | '' | null | undefined, u: UnitSystem): number | '' {
  return typeof typed === 'number' && Number.isFinite(typed) ? fromDisplay[q](typed, u) : ''
}

/** A label written in °C (a temperature band such as '10–15 °C') in the display system: '50–59 °F'. */
export function tempLabel(celsiusLabel: string, u: UnitSystem): string {
  if (u === 'metric' || !celsiusLabel.includes('°C')) return celsiusLabel
  return celsiusLabel.replace(/-?\d+(\.\d+)?/g, n => String(Math.round(toDisplay.temp(Number(n), u)))).replace(/°C/g, '°F')
}

const FIGURE_WITH_UNIT = /(-?\d+(?:\.\d+)?)\s?(kg|°C)(?![\w/])/g

/**
 * A sentence written in metric (a warning stored on a pour: "Lot L-7 will not cover the plaster
 * planned from it: 12.3 kg short.", "Slurry at 12.0 °C is below 15 °C") with each figure in kg
 * or °C written in the display system, to as many decimals as it was written with. Stored
 * sentences stay metric, like every stored figure, so a change of units reaches old pours too.
 */
export function inUnits(sentence: string, u: UnitSystem): string {
  if (u === 'metric') return sentence
  return sentence.replace(FIGURE_WITH_UNIT, (_, figure: string, unit: 'kg' | '°C') => {
    const digits = figure.split('.')[1]?.length ?? 0
    const q = unit === 'kg' ? 'mass' : 'temp'
    return `${toDisplay[q](Number(figure), u).toFixed(digits)} ${UNIT_LABELS[u][q]}`
  })
}

/** Consumables' units as people read them: m², m or each (metric); ft², ft or each (imperial). */
export const CONSUMABLE_UNIT_LABELS: Record<UnitSystem, Record<'m2' | 'm' | 'each', string>> = {
  metric: { m2: 'm²', m: 'm', each: 'each' },
  imperial: { m2: 'ft²', m: 'ft', each: 'each' },
}

/** A consumable's quantity (stored in m², m or a count) in the display system. */
export function consumableToDisplay(quantity: number, unit: 'm2' | 'm' | 'each', u: UnitSystem): number {
  if (u === 'metric' || unit === 'each') return quantity
  return unit === 'm2' ? quantity / (M_PER_FT * M_PER_FT) : quantity / M_PER_FT
}

/** A typed consumable quantity back to its stored unit (m², m or a count). */
export function consumableFromDisplay(typed: number, unit: 'm2' | 'm' | 'each', u: UnitSystem): number {
  if (u === 'metric' || unit === 'each') return typed
  return unit === 'm2' ? typed * M_PER_FT * M_PER_FT : typed * M_PER_FT
}

/**
 * A consumable's weight per unit (stored kg per m², per m or each) in the display system:
 * lb per ft², per ft or each on imperial. One display unit is consumableFromDisplay(1, …)
 * stored units, so it weighs that many times the stored figure.
 */
export function consumableWeightToDisplay(kgPerUnit: number, unit: 'm2' | 'm' | 'each', u: UnitSystem): number {
  return toDisplay.mass(kgPerUnit * consumableFromDisplay(1, unit, u), u)
}

/** A typed weight per display unit back to kg per stored unit. */
export function consumableWeightFromDisplay(typed: number, unit: 'm2' | 'm' | 'each', u: UnitSystem): number {
  return fromDisplay.mass(typed, u) / consumableFromDisplay(1, unit, u)
}
