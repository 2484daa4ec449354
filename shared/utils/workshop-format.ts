// How Setline writes days and times for people: always in the workshop's timezone (never the
// browser's or the server's), one style for days, one for times, one for both, and a 24-hour
// clock everywhere (pages, mails, CSV, the tablets' outbox). "Today" is the workshop's local
// day, never the UTC date. Pure (Intl only), shared by pages and the server.

/** The one locale Setline writes dates in: day before month, 24-hour clock. */
export const WORKSHOP_LOCALE = 'en-GB'

const CALENDAR_DAY = /^\d{4}-\d{2}-\d{2}$/

/**
 * Formatters by kind and zone, built once: building an Intl.DateTimeFormat loads the zone's
 * rules (milliseconds), formatting with a built one costs microseconds.
 */
const cache = new Map<string, Intl.DateTimeFormat>()
function formatter(kind: 'iso' | 'day' | 'time', timeZone: string): Intl.DateTimeFormat {
  const key = `${kind} ${timeZone}`
  let f = cache.get(key)
  if (!f) {
    f = kind === 'iso'
      ? new Intl.DateTimeFormat('en-CA', { timeZone, year: 'numeric', month: '2-digit', day: '2-digit' })
      : kind === 'day'
        ? new Intl.DateTimeFormat(WORKSHOP_LOCALE, { timeZone, weekday: 'short', day: 'numeric', month: 'short', year: 'numeric' })
        : new Intl.DateTimeFormat(WORKSHOP_LOCALE, { timeZone, hour: '2-digit', minute: '2-digit', hourCycle: 'h23' })
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

/** The day style, e.g. 'Thu 3 Dec 2026'. A 'yyyy-MM-dd' string is taken as that calendar day. */
export function formatDay(at: Date | string | number, timeZone: string): string {
  const day = typeof at === 'string' && CALENDAR_DAY.test(at)
  // a calendar day is written as itself: noon UTC of it, formatted in UTC, is that day
  const parts = formatter('day', day ? 'UTC' : timeZone).formatToParts(day ? new Date(`${at}T12:00:00Z`) : instant(at))
  const part = (type: string) => parts.find(p => p.type === type)?.value ?? ''
  return `${part('weekday')} ${part('day')} ${part('month')} ${part('year')}`
}

/** The time style, e.g. '07:05' or '19:40' (24-hour clock). */
export function formatTime(at: Date | string | number, timeZone: string): string {
  return formatter('time', timeZone).format(instant(at))
}

/** Both, e.g. 'Thu 3 Dec 2026 19:40'. */
export function formatDateTime(at: Date | string | number, timeZone: string): string {
  return `${formatDay(at, timeZone)} ${formatTime(at, timeZone)}`
}
