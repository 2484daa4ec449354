// How Setline writes days, times and numbers for people: always in the workshop's timezone
// (never the browser's or the server's), one style for days, one for times, one for both, and
// one for numbers, chosen by the workshop's locale (a setting). "Today" is the workshop's local
// day, never the UTC date. Pure (Intl only for a zone's offsets), shared by pages and the server.
//
// Locales (our decision, kept in WORKSHOP_LOCALES):
// - en-GB 'Thu 3 Dec 2026', en-US 'Thu, Dec 3, 2026': the day style follows the locale.
// - The clock stays the house's 24-hour clock ('14:05') in both: the floor reads times off a
//   tablet at arm's length and plans across midnight, where a missing or misread AM/PM puts a
//   demould twelve hours out. A locale entry names its own hourCycle, so a locale that should
//   read 12 hours can say so here; none does today.
// - Numbers: a point for decimals and a comma between thousands in both ('1,234.5').

export const WORKSHOP_LOCALES = {
  'en-GB': { label: 'English (UK): Thu 3 Dec 2026, 14:05', hourCycle: 'h23' },
  'en-US': { label: 'English (US): Thu, Dec 3, 2026, 14:05', hourCycle: 'h23' },
} as const satisfies Record<string, { label: string; hourCycle: 'h23' | 'h12' }>
export type WorkshopLocale = keyof typeof WORKSHOP_LOCALES

/** The locale of a workshop that has not chosen one: day before month, 24-hour clock. */
export const WORKSHOP_LOCALE: WorkshopLocale = 'en-GB'

/** A stored or sent locale as one Setline writes in (anything else is the default). */
export function workshopLocale(locale: string | null | undefined): WorkshopLocale {
  return locale && locale in WORKSHOP_LOCALES ? locale as WorkshopLocale : WORKSHOP_LOCALE
}

const CALENDAR_DAY = /^\d{4}-\d{2}-\d{2}$/

// Days, times and numbers are written from their parts by this module itself, not by Intl's
// patterns: what the pages and mails say cannot change with the ICU a browser or Node carries
// (a newer one writes en-GB September 'Sept', an older one 'Sep'; ours is always 'Sep'), and
// the server's page and the browser's hydration of it always agree. Intl is asked only for
// what needs the IANA tz rules: a zone's UTC offset at an instant. A browser's first Intl call
// of a page loads ICU (150-250 ms on a phone-class CPU, measured in Chromium at 4x slowdown),
// so the zone's offsets come with the signed-in person's workshop (GET /api/auth/me, computed
// here by zoneOffsets on the server) and are registered before the page hydrates; an instant
// outside them, or a zone not registered, asks Intl.
const WEEKDAYS = ['Sun', 'Mon', 'Tue', 'Wed', 'Thu', 'Fri', 'Sat'] as const
const MONTHS = ['Jan', 'Feb', 'Mar', 'Apr', 'May', 'Jun', 'Jul', 'Aug', 'Sep', 'Oct', 'Nov', 'Dec'] as const

/** A zone's UTC offsets over a span: from `from` (ms) each entry's offset (minutes) holds until the next entry's start; valid until `to`. */
export interface ZoneOffsets { zone: string; from: number; to: number; offsets: [startMs: number, minutes: number][] }

const registered = new Map<string, ZoneOffsets>()

/** Takes a zone's offsets (from GET /api/auth/me) for the formatting that follows. */
export function registerZoneOffsets(table: ZoneOffsets | null | undefined) {
  if (table?.offsets.length) registered.set(table.zone, table)
}

const offsetFormatters = new Map<string, Intl.DateTimeFormat>()
/** The zone's offset at an instant, in minutes, from Intl (the IANA rules it carries). */
function intlOffset(ms: number, zone: string): number {
  let f = offsetFormatters.get(zone)
  if (!f) {
    f = new Intl.DateTimeFormat('en-US', { timeZone: zone, hourCycle: 'h23', era: 'short', year: 'numeric', month: 'numeric', day: 'numeric', hour: 'numeric', minute: 'numeric', second: 'numeric' })
    offsetFormatters.set(zone, f)
  }
  const p: Record<string, string> = {}
  for (const part of f.formatToParts(ms)) p[part.type] = part.value
  const year = p.era === 'BC' || p.era === 'B' ? 1 - Number(p.year) : Number(p.year)
  const wall = new Date(0)
  wall.setUTCFullYear(year, Number(p.month) - 1, Number(p.day))
  wall.setUTCHours(Number(p.hour), Number(p.minute), Number(p.second), 0)
  const whole = ms - (((ms % 1000) + 1000) % 1000)
  return Math.round((wall.getTime() - whole) / 60_000)
}

/** The zone's offset at an instant in minutes: UTC at once, a registered span by search, else Intl. */
function offsetAt(ms: number, zone: string): number {
  if (zone === 'UTC' || zone === 'Etc/UTC') return 0
  const t = registered.get(zone)
  if (t && ms >= t.from && ms < t.to) {
    let lo = 0
    let hi = t.offsets.length - 1
    while (lo < hi) {
      const mid = (lo + hi + 1) >> 1
      if (t.offsets[mid]![0] <= ms) lo = mid
      else hi = mid - 1
    }
    return t.offsets[lo]![1]
  }
  return intlOffset(ms, zone)
}

/**
 * A zone's offsets from `fromMs` to `toMs` (the server's part: Intl has the rules). Sampled every
 * six hours and each change found to the minute by halving; no zone has changed its offset
 * twice within six hours (IANA tz database).
 */
export function zoneOffsets(zone: string, fromMs: number, toMs: number): ZoneOffsets {
  const STEP = 6 * 3_600_000
  const offsets: [number, number][] = [[fromMs, intlOffset(fromMs, zone)]]
  for (let at = fromMs; at < toMs; at += STEP) {
    const next = Math.min(at + STEP, toMs)
    const before = offsets.at(-1)![1]
    if (intlOffset(next, zone) === before) continue
    let lo = at
    let hi = next
    while (hi - lo > 60_000) {
      const mid = lo + Math.floor((hi - lo) / 120_000) * 60_000
      if (intlOffset(mid, zone) === before) lo = mid
      else hi = mid
    }
    offsets.push([hi, intlOffset(hi, zone)])
  }
  return { zone, from: fromMs, to: toMs, offsets }
}

/** An instant from a Date, an ISO string or epoch ms. */
function instantMs(at: Date | string | number): number {
  return at instanceof Date ? at.getTime() : typeof at === 'number' ? at : Date.parse(at)
}

/** The wall clock of an instant in the zone, as a Date whose UTC fields read it (RangeError for no instant, as Intl's). */
export function wallClock(at: Date | string | number, zone: string): Date {
  const ms = instantMs(at)
  if (!Number.isFinite(ms)) throw new RangeError('Invalid time value')
  return new Date(ms + offsetAt(ms, zone) * 60_000)
}

const pad = (n: number, width = 2) => String(n).padStart(width, '0')
const isoDay = (w: Date) => `${pad(w.getUTCFullYear(), 4)}-${pad(w.getUTCMonth() + 1)}-${pad(w.getUTCDate())}`

/** The calendar day 'yyyy-MM-dd' of an instant in the zone. */
export function dayIn(at: Date | string | number, timeZone: string): string {
  if (typeof at === 'string' && CALENDAR_DAY.test(at)) return at
  const w = wallClock(at, timeZone)
  return isoDay(w)
}

/** Today, 'yyyy-MM-dd', in the workshop's zone (`now` for tests and for a fixed instant). */
export function todayIn(timeZone: string, now: Date | number = Date.now()): string {
  return dayIn(now, timeZone)
}

/** Adds whole days to a 'yyyy-MM-dd' calendar day (no zone involved: a calendar day is a date). */
export function addCalendarDays(day: string, n: number): string {
  const [y, m, d] = day.split('-').map(Number) as [number, number, number]
  return new Date(Date.UTC(y, m - 1, d + n)).toISOString().slice(0, 10)
}

/**
 * The day style, e.g. 'Thu 3 Dec 2026' (en-GB) or 'Thu, Dec 3, 2026' (en-US). A 'yyyy-MM-dd'
 * string is taken as that calendar day (in every zone).
 */
export function formatDay(at: Date | string | number, timeZone: string, locale: WorkshopLocale = WORKSHOP_LOCALE): string {
  // a calendar day is written as itself (noon UTC of it read in UTC); an instant in the zone
  const w = typeof at === 'string' && CALENDAR_DAY.test(at) ? wallClock(`${at}T12:00:00Z`, 'UTC') : wallClock(at, timeZone)
  const [weekday, day, month, year] = [WEEKDAYS[w.getUTCDay()], w.getUTCDate(), MONTHS[w.getUTCMonth()], w.getUTCFullYear()]
  return locale === 'en-US' ? `${weekday}, ${month} ${day}, ${year}` : `${weekday} ${day} ${month} ${year}`
}

/** The time style, e.g. '07:05' or '19:40' (the house's 24-hour clock in every locale; '07:05 PM' where a locale reads 12 hours). */
export function formatTime(at: Date | string | number, timeZone: string, locale: WorkshopLocale = WORKSHOP_LOCALE): string {
  const w = wallClock(at, timeZone)
  const h = w.getUTCHours()
  const cycle = WORKSHOP_LOCALES[locale].hourCycle as 'h23' | 'h12'
  return cycle === 'h12' ? `${pad(h % 12 || 12)}:${pad(w.getUTCMinutes())} ${h < 12 ? 'AM' : 'PM'}` : `${pad(h)}:${pad(w.getUTCMinutes())}`
}

/** Both, e.g. 'Thu 3 Dec 2026 19:40' or 'Thu, Dec 3, 2026 19:40'. */
export function formatDateTime(at: Date | string | number, timeZone: string, locale: WorkshopLocale = WORKSHOP_LOCALE): string {
  return `${formatDay(at, timeZone, locale)} ${formatTime(at, timeZone, locale)}`
}

/**
 * The number style, e.g. '1,234.5': `digits` decimals exactly; '—' for a number that is not
 * finite. Rounded as Intl.NumberFormat rounds (ECMA-402, roundingMode halfExpand): half away
 * from zero on the number's shortest decimal form (ECMA-262 Number::toString), so 1.005 is
 * '1.01' (toFixed would say '1.00', rounding the binary value); both locales group thousands
 * with a comma and write a point. The unit test checks it against Intl itself.
 */
export function formatNumber(n: number, digits = 0, locale: WorkshopLocale = WORKSHOP_LOCALE): string {
  if (!Number.isFinite(n)) return '—'
  const abs = Math.abs(n)
  const shortest = String(abs)
  // the exponent forms (below 1e-6, from 1e21) are rare enough to leave to Intl
  if (shortest.includes('e')) return new Intl.NumberFormat(locale, { minimumFractionDigits: digits, maximumFractionDigits: digits }).format(n)
  const [whole, fraction = ''] = shortest.split('.') as [string, string?]
  const kept = BigInt(whole + fraction.slice(0, digits).padEnd(digits, '0')) + ((fraction[digits] ?? '0') >= '5' ? 1n : 0n)
  const text = kept.toString().padStart(digits + 1, '0')
  const grouped = text.slice(0, text.length - digits).replace(/\B(?=(\d{3})+(?!\d))/g, ',')
  return `${n < 0 || Object.is(n, -0) ? '-' : ''}${grouped}${digits ? `.${text.slice(text.length - digits)}` : ''}`
}
