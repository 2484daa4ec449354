/**
 * The workshop's calendar: its shift windows as instants, computed in the workshop's own
 * timezone so a shift that starts at 07:30 starts at 07:30 local time on both sides of a
 * daylight-saving change (Europe/London moves on the last Sunday of March and of October).
 *
 * Pure: no I/O, no framework import. Bad input throws PlanningInputError (a PlasterInputError,
 * so the routes' existing 422 mapping names the field).
 */
import { DateTime } from 'luxon'
import { PlasterInputError } from './plaster-core'

/** Bad planner or calendar input; `field` names the offending field. */
export class PlanningInputError extends PlasterInputError {
  constructor(field: string, message: string) {
    super(field, message)
    this.name = 'PlanningInputError'
  }
}

/**
 * A workshop's shift as stored on `workshops`: IANA timezone, shift start and end as local
 * wall-clock 'HH:MM' (PostgreSQL's 'HH:MM:SS' is accepted too) and ISO weekdays 1 = Mon … 7 = Sun.
 * Overnight shifts (end at or before start) are not supported: the data model has one shift a day.
 */
export interface WorkshopShiftCalendar {
  timezone: string
  shiftStart: string
  shiftEnd: string
  workingDays: number[]
  /** Breaks inside every working day's shift, local 'HH:MM' pairs (none when left out). */
  breaks?: { start: string; end: string }[]
}

/**
 * One working day's shift: `day` is the local date 'YYYY-MM-DD'; start and end are instants,
 * and the day's breaks as instants, in time order.
 */
export interface ShiftWindow {
  day: string
  start: Date
  end: Date
  breaks: { start: Date; end: Date }[]
}

const DAY_MS = 86_400_000
const MINUTE_MS = 60_000

/** 'HH:MM' or 'HH:MM:SS' → minutes after local midnight. */
export function parseShiftClock(value: unknown, field: string): number {
  const m = typeof value === 'string' ? /^(\d{2}):(\d{2})(?::(\d{2}))?$/.exec(value) : null
  const h = m ? Number(m[1]) : NaN
  const min = m ? Number(m[2]) : NaN
  if (!m || h > 23 || min > 59 || (m[3] !== undefined && Number(m[3]) > 59)) {
    throw new PlanningInputError(field, `${field} must be a time of day 'HH:MM'`)
  }
  return h * 60 + min
}

/** A valid, finite Date or PlanningInputError naming `field`. */
export function assertPlanningDate(value: unknown, field: string): Date {
  if (!(value instanceof Date) || !Number.isFinite(value.getTime())) {
    throw new PlanningInputError(field, `${field} must be a valid date`)
  }
  return value
}

/** Zones already checked: building an Intl.DateTimeFormat costs milliseconds. */
const knownTimezones = new Set<string>()

function assertTimezone(value: unknown): string {
  if (typeof value === 'string' && knownTimezones.has(value)) return value
  try {
    if (typeof value !== 'string' || value === '') throw new RangeError('empty')
    // Intl throws RangeError for a name outside the IANA database it carries.
    new Intl.DateTimeFormat('en', { timeZone: value })
    knownTimezones.add(value)
    return value
  }
  catch {
    throw new PlanningInputError('timezone', 'timezone must be an IANA timezone name such as Europe/London')
  }
}

interface CheckedCalendar {
  timezone: string
  startMin: number
  endMin: number
  days: Set<number>
  breaks: [number, number][]
}

function checkCalendar(cal: WorkshopShiftCalendar): CheckedCalendar {
  if (typeof cal !== 'object' || cal === null) throw new PlanningInputError('calendar', 'calendar must be an object')
  const timezone = assertTimezone(cal.timezone)
  const startMin = parseShiftClock(cal.shiftStart, 'shiftStart')
  const endMin = parseShiftClock(cal.shiftEnd, 'shiftEnd')
  if (endMin <= startMin) throw new PlanningInputError('shiftEnd', 'shiftEnd must be after shiftStart on the same day')
  const ok = Array.isArray(cal.workingDays) && cal.workingDays.length > 0
    && cal.workingDays.every(d => Number.isInteger(d) && d >= 1 && d <= 7)
  if (!ok) throw new PlanningInputError('workingDays', 'workingDays must list ISO weekdays 1 (Mon) to 7 (Sun), at least one')
  const breaks = (cal.breaks ?? []).map((b, i): [number, number] => {
    const bs = parseShiftClock(b?.start, `shiftBreaks.${i}.start`)
    const be = parseShiftClock(b?.end, `shiftBreaks.${i}.end`)
    if (be <= bs || bs < startMin || be > endMin) throw new PlanningInputError(`shiftBreaks.${i}`, `Break ${i + 1} must end after it starts, inside the shift`)
    return [bs, be]
  }).sort((a, b) => a[0] - b[0])
  return { timezone, startMin, endMin, days: new Set(cal.workingDays), breaks }
}

const pad = (n: number) => String(n).padStart(2, '0')

type ZoneOffset = (t: number) => number

/**
 * The zone's UTC offset in minutes (Luxon's: the IANA data through Intl) for
 * instants around [fromMs, toMs]. Intl is slow (tens of µs a call), so the offset is sampled
 * weekly and each change is bisected to the millisecond; lookups are then a binary search.
 * This misses only a zone that changes and changes back within one week, which no zone does.
 */
function zoneOffsets(tz: string, fromMs: number, toMs: number): ZoneOffset {
  const off = (t: number) => DateTime.fromMillis(t, { zone: tz }).offset
  const a = fromMs - 2 * DAY_MS
  const b = toMs + 2 * DAY_MS
  const at = [a]
  const offsets = [off(a)]
  for (let t = a; t < b;) {
    const next = Math.min(t + 7 * DAY_MS, b)
    const o = off(next)
    if (o !== offsets[offsets.length - 1]) {
      let [lo, hi] = [t, next]
      while (hi - lo > 1) {
        const mid = Math.floor((lo + hi) / 2)
        if (off(mid) === o) hi = mid
        else lo = mid
      }
      at.push(hi)
      offsets.push(o)
    }
    t = next
  }
  return (t) => {
    if (t < a || t > b) return off(t)
    let i = at.length - 1
    while (at[i]! > t) i--
    return offsets[i]!
  }
}

/**
 * The instant of local wall-clock `minutes` after midnight on the local date y-m-d (month
 * 0-based): the wall clock read as UTC less the zone's offset, accepted when the offset at the
 * result agrees (the usual two-pass conversion). A time repeated at a fall-back change gets the
 * instant that agrees first; a time inside a spring-forward gap moves forward by the gap, as
 * Luxon does (07:30 is never in a gap in Europe/London, whose changes happen at 01:00 UTC).
 */
function localInstant(offset: ZoneOffset, y: number, m: number, d: number, minutes: number): Date {
  const wall = Date.UTC(y, m, d, Math.floor(minutes / 60), minutes % 60)
  const o1 = offset(wall)
  const c1 = wall - o1 * MINUTE_MS
  const o2 = offset(c1)
  if (o2 === o1) return new Date(c1)
  const c2 = wall - o2 * MINUTE_MS
  if (offset(c2) === o2) return new Date(c2)
  return new Date(Math.max(c1, c2))
}

/**
 * Shift windows, in time order, of every working day whose shift overlaps [from, to)
 * (whole windows, not clipped to the range). Days are walked as local calendar dates, and
 * each start and end is built from the local wall clock, so a DST day keeps 07:30–16:00 local
 * (its window is then 8.5 h of real time as on any other day; only a shift spanning the
 * 01:00–02:00 change itself would be shorter or longer).
 */
export function shiftWindows(input: WorkshopShiftCalendar & { from: Date; to: Date }): ShiftWindow[] {
  const cal = checkCalendar(input)
  const from = assertPlanningDate(input.from, 'from').getTime()
  const to = assertPlanningDate(input.to, 'to').getTime()
  const local = DateTime.fromMillis(from, { zone: cal.timezone })
  const offset = zoneOffsets(cal.timezone, from, to)
  // Walk local dates with UTC date arithmetic (no DST there), from the local date of `from`.
  let date = Date.UTC(local.year, local.month - 1, local.day)
  const windows: ShiftWindow[] = []
  for (;;) {
    const u = new Date(date)
    const [y, m, d] = [u.getUTCFullYear(), u.getUTCMonth(), u.getUTCDate()]
    const start = localInstant(offset, y, m, d, cal.startMin)
    if (start.getTime() >= to) break
    const isoDay = u.getUTCDay() === 0 ? 7 : u.getUTCDay()
    const end = localInstant(offset, y, m, d, cal.endMin)
    if (cal.days.has(isoDay) && end.getTime() > from) {
      const breaks = cal.breaks.map(([bs, be]) => ({ start: localInstant(offset, y, m, d, bs), end: localInstant(offset, y, m, d, be) }))
      windows.push({ day: `${y}-${pad(m + 1)}-${pad(d)}`, start, end, breaks })
    }
    date += DAY_MS
  }
  return windows
}

/** True when `at` falls inside a shift: start ≤ at < end (half-open, like the pours' tstzrange slots). */
export function isInsideShift(calendar: WorkshopShiftCalendar, at: Date): boolean {
  const t = assertPlanningDate(at, 'at').getTime()
  const windows = shiftWindows({ ...calendar, from: new Date(t - DAY_MS), to: new Date(t + DAY_MS) })
  return windows.some(w => w.start.getTime() <= t && t < w.end.getTime())
}

/**
 * The first shift start at or after `at` (at a shift's very start that start itself), looking
 * up to 14 days ahead, which any non-empty working week reaches.
 */
export function nextShiftStart(calendar: WorkshopShiftCalendar, at: Date): Date {
  const t = assertPlanningDate(at, 'at').getTime()
  const windows = shiftWindows({ ...calendar, from: new Date(t), to: new Date(t + 14 * DAY_MS) })
  const next = windows.find(w => w.start.getTime() >= t)
  if (!next) throw new PlanningInputError('workingDays', 'no shift starts within 14 days')
  return next.start
}

/** A shift window as epoch milliseconds (the planner's own form): its breaks as [start, end) pairs. */
export interface ShiftSpan { start: number; end: number; breaks: [number, number][] }

/**
 * The instant `ms` of shift time after `t`, counting only inside the windows (in time order)
 * and outside their breaks; null when the windows run out first. Work done by people (fettling
 * a cast) waits for the shift: two hours of it from a demould at 15:30 in a shift ending at
 * 16:00 end at 09:00 the next working morning when the shift starts at 07:30.
 */
export function afterShiftTime(windows: readonly ShiftSpan[], t: number, ms: number): number | null {
  if (!(ms > 0)) return t
  let left = ms
  for (const w of windows) {
    if (w.end <= t) continue
    // the window less its breaks, as working spans in order
    let from = w.start
    const spans: [number, number][] = []
    for (const [bs, be] of [...w.breaks].sort((a, b) => a[0] - b[0])) {
      if (bs > from) spans.push([from, Math.min(bs, w.end)])
      from = Math.max(from, be)
    }
    if (from < w.end) spans.push([from, w.end])
    for (const [s, e] of spans) {
      const begin = Math.max(s, t)
      if (e <= begin) continue
      if (e - begin >= left) return begin + left
      left -= e - begin
    }
  }
  return null
}

/**
 * afterShiftTime on the workshop's calendar, less `closedDays` (holidays: local days, both ends
 * of each span included), looking up to 60 days ahead.
 */
export function addShiftHours(calendar: WorkshopShiftCalendar, at: Date, hours: number, closedDays: readonly { fromDay: string; toDay: string }[] = []): Date {
  const t = assertPlanningDate(at, 'at').getTime()
  const spans = shiftWindows({ ...calendar, from: new Date(t - DAY_MS), to: new Date(t + 60 * DAY_MS) })
    .filter(w => !closedDays.some(c => c.fromDay <= w.day && w.day <= c.toDay))
    .map(w => ({ start: w.start.getTime(), end: w.end.getTime(), breaks: w.breaks.map((b): [number, number] => [b.start.getTime(), b.end.getTime()]) }))
  const end = afterShiftTime(spans, t, hours * 3_600_000)
  if (end === null) throw new PlanningInputError('workingDays', `no ${hours} h of shift within 60 days`)
  return new Date(end)
}
