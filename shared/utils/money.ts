/**
 * Money for quotes, deposits and invoices. Pure.
 *
 * Money is exact: every amount is an integer count of the currency's minor unit (pence, cents),
 * never a float, and one workshop keeps one currency. The number of minor digits comes from the
 * currency's ISO 4217 exponent as the runtime's Intl reports it (2 for GBP, EUR, USD; 0 for JPY).
 * Rates and percentages are applied with integer arithmetic (BigInt) and rounded once, half away
 * from zero, to the minor unit (the usual commercial rounding; common practice).
 */
import { PlasterInputError } from './plaster-core'

/** A refused amount or rate, naming its field; mapped to a 422 like the model's other errors. */
export class MoneyInputError extends PlasterInputError {
  constructor(field: string, message: string) {
    super(field, message)
    this.name = 'MoneyInputError'
  }
}

/** Largest amount in minor units Setline accepts: well inside Number's exact integers. */
export const MAX_MINOR = 1e13

/** Decimal digits of the currency's minor unit, from its ISO 4217 exponent. */
export function minorDigits(currency: string): number {
  try {
    return new Intl.NumberFormat('en', { style: 'currency', currency }).resolvedOptions().maximumFractionDigits ?? 2
  }
  catch {
    throw new MoneyInputError('currency', `currency "${currency}" is not an ISO 4217 code`)
  }
}

/** Checks an amount in minor units: an integer, not negative, not absurdly large. */
export function assertMinor(value: unknown, field: string): number {
  if (typeof value !== 'number' || !Number.isInteger(value) || value < 0 || value > MAX_MINOR) {
    throw new MoneyInputError(field, `${field} must be a whole number of minor units from 0 to ${MAX_MINOR}`)
  }
  return value
}

/**
 * Reads an amount typed by a person ("12.50", "1,250.5", "12") as minor units. More decimals than
 * the currency has is refused rather than rounded: a price is never silently changed.
 */
export function parseMoney(text: string, currency: string, field = 'amount'): number {
  const digits = minorDigits(currency)
  const t = text.trim().replace(/,/g, '')
  const m = /^(\d+)(?:\.(\d*))?$/.exec(t)
  if (!m) throw new MoneyInputError(field, `${field} must be an amount like 12.50`)
  const frac = m[2] ?? ''
  if (frac.length > digits) {
    throw new MoneyInputError(field, `${field} has more than ${digits} decimal place${digits === 1 ? '' : 's'}`)
  }
  const minor = Number(BigInt(m[1]!) * 10n ** BigInt(digits) + BigInt((frac + '0'.repeat(digits)).slice(0, digits) || '0'))
  return assertMinor(minor, field)
}

/** Writes minor units in the workshop's locale and currency ("£1,250.50"). */
export function formatMoney(minor: number, currency: string, locale = 'en-GB'): string {
  const digits = minorDigits(currency)
  const sign = minor < 0 ? '-' : ''
  const abs = BigInt(Math.abs(minor))
  const scale = 10n ** BigInt(digits)
  const whole = abs / scale
  const frac = (abs % scale).toString().padStart(digits, '0')
  // Intl formats the decimal string exactly; the amount never passes through a float fraction.
  const decimal = `${sign}${whole}${digits > 0 ? `.${frac}` : ''}`
  return new Intl.NumberFormat(locale, { style: 'currency', currency, minimumFractionDigits: digits })
    .format(decimal as unknown as number)
}

/** n / d rounded half away from zero, in integers. */
function divRound(n: bigint, d: bigint): bigint {
  const neg = (n < 0n) !== (d < 0n)
  const an = n < 0n ? -n : n
  const ad = d < 0n ? -d : d
  const q = (2n * an + ad) / (2n * ad)
  return neg ? -q : q
}

/** Quantities are exact to a thousandth (a millimetre on metres, a gram on kilograms). */
export const QUANTITY_SCALE = 1000

/** A quantity as integer thousandths; refuses more precision than that. */
export function quantityMilli(qty: number, field: string): bigint {
  if (typeof qty !== 'number' || !Number.isFinite(qty) || qty < 0 || qty > 1e9) {
    throw new MoneyInputError(field, `${field} must be a number from 0 to 1,000,000,000`)
  }
  const milli = Math.round(qty * QUANTITY_SCALE)
  if (Math.abs(milli - qty * QUANTITY_SCALE) > 1e-6 * Math.max(1, milli)) {
    throw new MoneyInputError(field, `${field} has more than 3 decimal places`)
  }
  return BigInt(milli)
}

/** quantity × rate (minor units per unit), rounded once to the minor unit. */
export function lineAmount(qty: number, rateMinor: number, field = 'quantity'): number {
  const rate = BigInt(assertMinor(rateMinor, 'rate'))
  return assertMinor(Number(divRound(quantityMilli(qty, field) * rate, BigInt(QUANTITY_SCALE))), 'line total')
}

/** A share of an amount in basis points (1 % = 100 bp), rounded once to the minor unit. */
export function shareOf(minor: number, basisPoints: number, field = 'percentage'): number {
  if (!Number.isInteger(basisPoints) || basisPoints < 0 || basisPoints > 100_000) {
    throw new MoneyInputError(field, `${field} must be from 0 to 1000 % in steps of 0.01 %`)
  }
  return Number(divRound(BigInt(assertMinor(minor, 'amount')) * BigInt(basisPoints), 10_000n))
}

/** A percentage typed as a number (12.5) in basis points (1250); refuses finer than 0.01 %. */
export function percentToBasisPoints(pct: number, field = 'percentage'): number {
  const bp = Math.round(pct * 100)
  if (!Number.isFinite(pct) || pct < 0 || pct > 1000 || Math.abs(bp - pct * 100) > 1e-6) {
    throw new MoneyInputError(field, `${field} must be from 0 to 1000 % in steps of 0.01 %`)
  }
  return bp
}
