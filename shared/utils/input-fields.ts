// Zod building blocks every route schema shares: ids written in a URL or a form, versions,
// calendar days and instants. Their bounds keep values PostgreSQL cannot hold away from the
// database, so odd input is a 422 naming the field rather than a database error (500).
import { z } from 'zod'

/** The largest PostgreSQL `integer` (versions are integer columns): 2^31 − 1. */
export const PG_INTEGER_MAX = 2_147_483_647

/**
 * The years a workshop's days and instants may fall in. PostgreSQL has no year 0 and
 * JavaScript writes years past 9999 with a sign, so far-off dates are typing slips: refused.
 */
export const CALENDAR_YEARS = { min: 1900, max: 2999 } as const

/** 'YYYY-MM-DD' that is a real calendar day (no 30 February) within CALENDAR_YEARS. */
export function isCalendarDay(v: string): boolean {
  if (!/^\d{4}-\d{2}-\d{2}$/.test(v)) return false
  const year = Number(v.slice(0, 4))
  if (year < CALENDAR_YEARS.min || year > CALENDAR_YEARS.max) return false
  const d = new Date(`${v}T00:00:00Z`)
  return Number.isFinite(d.getTime()) && d.toISOString().slice(0, 10) === v
}

/** An ISO date-time ('YYYY-MM-DDT…') whose day is a calendar day and which parses. */
export function isCalendarInstant(v: string): boolean {
  return /^\d{4}-\d{2}-\d{2}T/.test(v) && isCalendarDay(v.slice(0, 10)) && Number.isFinite(Date.parse(v))
}

/**
 * A positive whole id written as text (a path parameter, a query or form value): digits only,
 * so '1e3', ' 1' and '0x10' are refused rather than read as 1000, 1 and 16.
 */
export function idText(field: string) {
  const message = `${field} must be a positive whole number`
  return z.string({ error: message }).regex(/^\d{1,16}$/, { error: message }).transform(Number)
    .pipe(z.number().int({ error: message }).positive({ error: message }).max(Number.MAX_SAFE_INTEGER, { error: message }))
}

/**
 * The fields of a request (a JSON body, a query, path parameters, form fields) whose text holds
 * a NUL character, as dotted paths ('notes', 'pours.0.caption'). PostgreSQL cannot store NUL
 * in text or jsonb ("invalid byte sequence for encoding UTF8: 0x00", PostgreSQL manual §8.3),
 * and no one types it: such input is refused as a whole before any schema or query sees it.
 */
export function fieldsWithNul(value: unknown, at: string[] = []): string[] {
  if (typeof value === 'string') return value.includes('\u0000') ? [at.join('.')] : []
  if (Array.isArray(value)) return value.flatMap((v, i) => fieldsWithNul(v, [...at, String(i)]))
  if (value && typeof value === 'object') {
    return Object.entries(value).flatMap(([k, v]) => (k.includes('\u0000') ? [[...at, k].join('.')] : fieldsWithNul(v, [...at, k])))
  }
  return []
}

/** What a 422 says about a field with a NUL character in it. */
export const NUL_MESSAGE = 'must not contain a NUL character (\\u0000)'
