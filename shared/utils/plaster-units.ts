/**
 * Metric ↔ US customary conversions for display. Exact definitions from NIST SP 811 (2008),
 * Appendix B: 1 lb = 0.45359237 kg, 1 in = 25.4 mm, 1 US gallon = 3.785411784 L, and
 * °F = °C × 9/5 + 32. Re-exported from `plaster.ts`. Pure.
 */
import { PlasterInputError } from './plaster-core'

/** kg per avoirdupois pound, exact (NIST SP 811). */
export const KG_PER_LB = 0.45359237
/** mm per inch, exact (NIST SP 811). */
export const MM_PER_IN = 25.4
/** litres per US liquid gallon, exact (NIST SP 811). */
export const LITRES_PER_US_GALLON = 3.785411784

function finite(value: number, field: string): number {
  if (typeof value !== 'number' || !Number.isFinite(value)) {
    throw new PlasterInputError(field, `${field} must be a finite number`)
  }
  return value
}

/** °C → °F. */
export function cToF(tempC: number): number {
  return (finite(tempC, 'tempC') * 9) / 5 + 32
}

/** °F → °C. */
export function fToC(tempF: number): number {
  return ((finite(tempF, 'tempF') - 32) * 5) / 9
}

/** kg → lb. */
export function kgToLb(kg: number): number {
  return finite(kg, 'kg') / KG_PER_LB
}

/** lb → kg. */
export function lbToKg(lb: number): number {
  return finite(lb, 'lb') * KG_PER_LB
}

/** mm → in. */
export function mmToIn(mm: number): number {
  return finite(mm, 'mm') / MM_PER_IN
}

/** in → mm. */
export function inToMm(inches: number): number {
  return finite(inches, 'in') * MM_PER_IN
}

/** litres → US gallons. */
export function litresToUsGallons(litres: number): number {
  return finite(litres, 'litres') / LITRES_PER_US_GALLON
}

/** US gallons → litres. */
export function usGallonsToLitres(usGallons: number): number {
  return finite(usGallons, 'usGallons') * LITRES_PER_US_GALLON
}
