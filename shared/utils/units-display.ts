// Display units. Setline computes and stores metric (kg, L, °C, m); a workshop may show
// imperial (lb, US gal, °F, in). Conversions are the exact factors of NIST SP 811, from
// plaster-units.ts; these helpers only format and parse for people.
import { cToF, fToC, kgToLb, lbToKg, litresToUsGallons, usGallonsToLitres } from './plaster-units'

export type UnitSystem = 'metric' | 'imperial'

export const UNIT_LABELS: Record<UnitSystem, { mass: string; temp: string; volume: string; length: string }> = {
  metric: { mass: 'kg', temp: '°C', volume: 'L', length: 'm' },
  imperial: { mass: 'lb', temp: '°F', volume: 'US gal', length: 'in' },
}

const M_PER_IN = 0.0254

/** A metric value in the display system (numbers, for inputs and charts). */
export const toDisplay = {
  mass: (kg: number, u: UnitSystem) => (u === 'imperial' ? kgToLb(kg) : kg),
  temp: (c: number, u: UnitSystem) => (u === 'imperial' ? cToF(c) : c),
  tempDelta: (dc: number, u: UnitSystem) => (u === 'imperial' ? dc * 1.8 : dc),
  volume: (l: number, u: UnitSystem) => (u === 'imperial' ? litresToUsGallons(l) : l),
  length: (m: number, u: UnitSystem) => (u === 'imperial' ? m / M_PER_IN : m),
}

/** A display-system value back to metric (what an input in °F or lb means). */
export const fromDisplay = {
  mass: (v: number, u: UnitSystem) => (u === 'imperial' ? lbToKg(v) : v),
  temp: (v: number, u: UnitSystem) => (u === 'imperial' ? fToC(v) : v),
  volume: (v: number, u: UnitSystem) => (u === 'imperial' ? usGallonsToLitres(v) : v),
  length: (v: number, u: UnitSystem) => (u === 'imperial' ? v * M_PER_IN : v),
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
}
