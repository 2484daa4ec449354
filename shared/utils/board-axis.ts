// The pour board's time axis: which days and hours a view shows, and where an instant falls on
// it. One reckoning for the two drawings of the board: the calendar (BoardTimeline, FullCalendar
// told the hours and days as options) and the first screen the server draws before the
// calendar has loaded (BoardSketch, bars placed by share of the lane's width).
//
// A view shows the shift's whole hours of the working days, widened to take in any pour that
// reaches outside them: a pour planned at night or on a day off must still be drawn (hiding it
// would hide work). Week and fortnight start on the first day shown (Monday for a shop that
// works it). All wall clocks are the workshop's zone (workshop-format.ts wallClock: the zone's
// offsets registered from the server, else Intl's IANA rules).
import type { BoardView } from '../types/board'
import { addCalendarDays, formatDay, wallClock, workshopLocale } from './workshop-format'

export interface AxisWorkshop {
  timezone: string
  shiftStart: string
  shiftEnd: string
  /** ISO weekdays, 1 (Monday) to 7 (Sunday) */
  workingDays: number[]
}
export interface AxisPour { state: string; slotStart: string; slotEnd: string }

const DAY_MS = 86_400_000
const hour = (clock: string) => Number(clock.slice(0, 2))
const ceilHour = (clock: string) => hour(clock) + (clock.slice(3, 5) === '00' ? 0 : 1)
export const VIEW_DAYS: Record<BoardView, number> = { day: 1, week: 7, fortnight: 14 }
/** The calendar's slot (one column of the ruler) in each view, in minutes. */
export const SLOT_MINUTES: Record<BoardView, number> = { day: 15, week: 60, fortnight: 60 }
/**
 * A slot's least width in px at zoom 1: small enough that the calendar stretches the slots to fit
 * a desktop's width; zoom multiplies it, and a view wider than the screen scrolls sideways.
 */
export const BASE_SLOT_WIDTH: Record<BoardView, number> = { day: 12, week: 14, fortnight: 12 }

/**
 * The moulds on a large board's first screen: the calendar draws a board of many bars in two
 * passes (BoardTimeline says why), first these rows with their bars, and the server's sketch
 * draws bars in these rows only. `moulds` come in the calendar's row order (benchOrder: the
 * board's data sends them so). Null for a small board, drawn whole at once.
 */
export const FIRST_SCREEN_ROWS = 14
export const FIRST_SCREEN_FROM_POURS = 200
export function firstScreenMoulds(moulds: { id: number }[], pours: number): Set<number> | null {
  if (pours < FIRST_SCREEN_FROM_POURS) return null
  return new Set(moulds.slice(0, FIRST_SCREEN_ROWS).map(m => m.id))
}
/**
 * Moulds in the calendar's row order: bench (no bench sorts as 'No bench'), then code, compared
 * as FullCalendar's resourceOrder compares strings (localeCompare). The server sorts the board's
 * moulds so (server/queries/board.ts): a string's first localeCompare on a page loads the
 * browser's collation data (about 85 ms at a phone's 4x CPU slowdown), which the page's start
 * need not pay for the sketch.
 */
export function benchOrder<M extends { code: string; benchName: string | null }>(moulds: M[]): M[] {
  return [...moulds].sort((a, b) => (a.benchName ?? 'No bench').localeCompare(b.benchName ?? 'No bench') || a.code.localeCompare(b.code))
}

/** The hours (first, last) and weekdays (0 Sunday to 6 Saturday) the pours on view reach; void pours do not count. */
export function poursReach(pours: AxisPour[], zone: string) {
  let first = 24
  let last = 0
  const days = new Set<number>()
  for (const p of pours) {
    if (p.state === 'void') continue
    const start = wallClock(p.slotStart, zone)
    const end = wallClock(p.slotEnd, zone)
    first = Math.min(first, start.getUTCHours())
    const sameDay = Math.floor(start.getTime() / DAY_MS) === Math.floor(end.getTime() / DAY_MS)
    last = Math.max(last, sameDay ? end.getUTCHours() + (end.getUTCMinutes() ? 1 : 0) : 24)
    days.add(start.getUTCDay())
  }
  return { first, last, days }
}

/** The hours and weekdays a view shows (the calendar's slotMinTime, slotMaxTime, hidden days and first day). */
export function viewHours(w: AxisWorkshop, pours: AxisPour[]) {
  const reach = poursReach(pours, w.timezone)
  const shown = [...new Set([...w.workingDays.map(d => d % 7), ...reach.days])]
  const firstHour = Math.min(hour(w.shiftStart), reach.first)
  const lastHour = Math.min(24, Math.max(ceilHour(w.shiftEnd), reach.last, firstHour + 1))
  return {
    firstHour,
    lastHour,
    /** weekdays shown, 0 (Sunday) to 6 */
    shownDays: shown,
    /** the weekday a week starts on, 1 (Monday) to 7 (Sunday): the first shown day counted from Monday */
    firstDay: shown.length ? Math.min(...shown.map(d => (d + 6) % 7)) + 1 : 1,
  }
}

/** A day on the ruler of the week and fortnight: the house's day style without the year ('Mon 30 Nov', en-US 'Mon, Nov 30'). */
export function rulerDayLabel(day: string, locale: string | null | undefined): string {
  return formatDay(day, 'UTC', workshopLocale(locale)).replace(/,? \d{4}$/, '')
}

/** The weekday (0 Sunday to 6 Saturday) of a 'yyyy-MM-dd' day. */
const weekdayOf = (day: string) => new Date(`${day}T12:00:00Z`).getUTCDay()

/**
 * The axis of one view: its days ('yyyy-MM-dd', days not shown left out), its hours, and
 * `at(iso)`, where an instant falls as a share (0 to 1) of the lane's width. An instant in the
 * night or on a day not shown falls at the start of the next shown stretch.
 */
export function boardAxis(w: AxisWorkshop, pours: AxisPour[], view: BoardView, date: string) {
  const h = viewHours(w, pours)
  const shown = new Set(h.shownDays)
  const start = view === 'day' ? date : addCalendarDays(date, -((weekdayOf(date) - (h.firstDay % 7) + 7) % 7))
  const days: string[] = []
  for (let i = 0; i < VIEW_DAYS[view]; i++) {
    const d = addCalendarDays(start, i)
    if (view === 'day' || shown.has(weekdayOf(d))) days.push(d)
  }
  const span = (h.lastHour - h.firstHour) * 60
  const total = days.length * span
  function at(iso: string): number {
    const wall = wallClock(iso, w.timezone)
    const day = wall.toISOString().slice(0, 10)
    const minutes = wall.getUTCHours() * 60 + wall.getUTCMinutes() - h.firstHour * 60
    const i = days.findIndex(d => d >= day)
    if (i < 0) return 1
    if (days[i] !== day) return (i * span) / total
    return (i * span + Math.min(span, Math.max(0, minutes))) / total
  }
  return { days, firstHour: h.firstHour, lastHour: h.lastHour, slots: total / SLOT_MINUTES[view], at }
}
