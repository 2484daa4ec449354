// How Setline writes days, times and numbers for people: always in the workshop's timezone
// (never the browser's or the server's), one style for days, one for times, one for both, and
// one for numbers, chosen by the workshop's locale (a setting). "Today" is the workshop's local
// day, never the UTC date. Pure (Intl only), shared by pages and the server.
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

/**
 * Formatters by kind and zone, built once: building an Intl.DateTimeFormat loads the zone's
 * rules (milliseconds), formatting with a built one costs microseconds.
 */
const cache = new Map<string, Intl.DateTimeFormat>()
function formatter(kind: 'iso' | 'day' | 'time', timeZone: string, locale: WorkshopLocale = WORKSHOP_LOCALE): Intl.DateTimeFormat {
  const key = `${kind} ${timeZone} ${locale}`
  let f = cache.get(key)
  if (!f) {
    f = kind === 'iso'
      ? new Intl.DateTimeFormat('en-CA', { timeZone, year: 'numeric', month: '2-digit', day: '2-digit' })
      : kind === 'day'
        ? new Intl.DateTimeFormat(locale, { timeZone, weekday: 'short', day: 'numeric', month: 'short', year: 'numeric' })
        : new Intl.DateTimeFormat(locale, { timeZone, hour: '2-digit', minute: '2-digit', hourCycle: WORKSHOP_LOCALES[locale].hourCycle })
    cache.set(key, f)
  }
  return f
}

/** An instant from a Date or an ISO string; a bare 'yyyy-MM-dd' is that calendar day. */
function instant(at: Date | string | number): Date {
  return at instanceof Date ? at : new Date(at)
}

/** The calendar day 'yyyy-MM-dd' of an instant in the zone. */
export function dayIn(at: Date | string | number, timeZone: string): string {
  if (typeof at === 'string' && CALENDAR_DAY.test(at)) return at
  return formatter('iso', timeZone).format(instant(at))
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
 * string is taken as that calendar day. Built from the parts, not Intl's own pattern, so a
 * newer ICU adding or dropping a comma cannot change what the pages and mails say.
 */
export function formatDay(at: Date | string | number, timeZone: string, locale: WorkshopLocale = WORKSHOP_LOCALE): string {
  const day = typeof at === 'string' && CALENDAR_DAY.test(at)
  // a calendar day is written as itself: noon UTC of it, formatted in UTC, is that day
  const parts = formatter('day', day ? 'UTC' : timeZone, locale).formatToParts(day ? new Date(`${at}T12:00:00Z`) : instant(at))
  const part = (type: string) => parts.find(p => p.type === type)?.value ?? ''
  return locale === 'en-US'
    ? `${part('weekday')}, ${part('month')} ${part('day')}, ${part('year')}`
    : `${part('weekday')} ${part('day')} ${part('month')} ${part('year')}`
}

/** The time style, e.g. '07:05' or '19:40' (the house's 24-hour clock in every locale). */
export function formatTime(at: Date | string | number, timeZone: string, locale: WorkshopLocale = WORKSHOP_LOCALE): string {
  return formatter('time', timeZone, locale).format(instant(at))
}

/** Both, e.g. 'Thu 3 Dec 2026 19:40' or 'Thu, Dec 3, 2026 19:40'. */
export function formatDateTime(at: Date | string | number, timeZone: string, locale: WorkshopLocale = WORKSHOP_LOCALE): string {
  return `${formatDay(at, timeZone, locale)} ${formatTime(at, timeZone, locale)}`
}

const numbers = new Map<string, Intl.NumberFormat>()
/** The number style, e.g. '1,234.5': `digits` decimals exactly; '—' for a number that is not finite. */
export function formatNumber(n: number, digits = 0, locale: WorkshopLocale = WORKSHOP_LOCALE): string {
  if (!Number.isFinite(n)) return '—'
  const key = `${locale} ${digits}`
  let f = numbers.get(key)
  if (!f) {
    f = new Intl.NumberFormat(locale, { minimumFractionDigits: digits, maximumFractionDigits: digits })
    numbers.set(key, f)
  }
  return f.format(n)
}
