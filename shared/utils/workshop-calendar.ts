/**
 * The workshop's calendar: its shift windows as instants, computed in the workshop's own
 * timezone so a shift that starts at 07:30 starts at 07:30 local time on both sides of a
 * daylight-saving change (Europe/London moves on the last Sunday of March and of October).
 *
 * Pure: no I/O, no framework import. Bad input throws PlanningInputError (a PlasterInputError,
 * so the routes' existing 422 mapping names the field).
 */
import { TZDate } from '@date-fns/tz'
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
}

/** One working day's shift: `day` is the local date 'YYYY-MM-DD'; start and end are instants. */
export interface ShiftWindow {
  day: string
  start: Date
  end: Date
}

const DAY_MS = 86_400_000

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

function assertTimezone(value: unknown): string {
  try {
    if (typeof value !== 'string' || value === '') throw new RangeError('empty')
    // Intl throws RangeError for a name outside the IANA database it carries.
    new Intl.DateTimeFormat('en', { timeZone: value })
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
  return { timezone, startMin, endMin, days: new Set(cal.workingDays) }
}

const pad = (n: number) => String(n).padStart(2, '0')

/** The instant of local wall-clock `minutes` after midnight on the local date y-m-d (month 0-based). */
function localInstant(tz: string, y: number, m: number, d: number, minutes: number): Date {
  return new Date(new TZDate(y, m, d, Math.floor(minutes / 60), minutes % 60, 0, 0, tz).getTime())
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
  const local = new TZDate(from, cal.timezone)
  // Walk local dates with UTC date arithmetic (no DST there), from the local date of `from`.
  let date = Date.UTC(local.getFullYear(), local.getMonth(), local.getDate())
  const windows: ShiftWindow[] = []
  for (;;) {
    const u = new Date(date)
    const [y, m, d] = [u.getUTCFullYear(), u.getUTCMonth(), u.getUTCDate()]
    const start = localInstant(cal.timezone, y, m, d, cal.startMin)
    if (start.getTime() >= to) break
    const isoDay = u.getUTCDay() === 0 ? 7 : u.getUTCDay()
    const end = localInstant(cal.timezone, y, m, d, cal.endMin)
    if (cal.days.has(isoDay) && end.getTime() > from) windows.push({ day: `${y}-${pad(m + 1)}-${pad(d)}`, start, end })
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
