/**
 * The pour board's rules that need no database: when a pour is overdue, when a mould nears
 * or passes its life, what a lot has left, the warnings a planned pour carries, and the day
 * sheet's plaster requisition. The server gathers the facts; these decide.
 *
 * Units: masses kg, water litres (1 kg/L, as the plaster model's MIX_WATER_DENSITY), minutes.
 * Pure: no I/O, no framework import.
 */
import { DateTime } from 'luxon'
import { bagsForKg } from './plaster-cutlist'
import { MIX_WATER_DENSITY } from './plaster-core'
import { POUR_MIX_MINUTES_DEFAULT, dwellWarning } from './pour-timing'
import { nextShiftStart, shiftWindows, type WorkshopShiftCalendar } from './workshop-calendar'
import { formatDateTime, type WorkshopLocale } from './workshop-format'

const MINUTE_MS = 60_000

/** A mould is flagged on the board from 90 % of its expected pulls (common practice: order or make the replacement before the last casts). */
export const MOULD_LIFE_FLAG_FRACTION = 0.9

/** Planned plaster carries 5 % over the cavity for what stays in the bowl and on the tools (common practice). */
export const POUR_WASTE_PCT = 5

export type BoardPourState = 'planned' | 'mixing' | 'setting' | 'demoulded' | 'void'

/**
 * Overdue demould: the pour's demould window has closed with a cast still in the mould, i.e. a
 * mixing or setting pour with now past demouldCloseAt (it risks a stuck or cracked cast). A
 * planned pour past its time was never cast: that is a missed start, told apart
 * (pourSituation in pour-status.ts, the one classification every screen uses).
 */
export function pourOverdue(p: { state: BoardPourState; demouldCloseAt: Date }, now: Date): boolean {
  if (p.state !== 'mixing' && p.state !== 'setting') return false
  return now.getTime() > p.demouldCloseAt.getTime()
}

/** True from MOULD_LIFE_FLAG_FRACTION of the expected pulls; a mould with no known life is never flagged. */
export function mouldLifeFlag(pulls: number, expectedPulls: number | null): boolean {
  if (expectedPulls === null || expectedPulls === undefined) return false
  return pulls >= MOULD_LIFE_FLAG_FRACTION * expectedPulls
}

/** kg left in a lot: bags received × bag kg less the plaster of the non-void pours using it. */
export function lotStockKg(lot: { bagsReceived: number; bagKg: number }, usedKg: number): number {
  return lot.bagsReceived * lot.bagKg - usedKg
}

/** Whether two gauging intervals [mixAt, mixAt + minutes) overlap (one caster, one bowl at a time). */
export function mixesOverlap(a: Date, b: Date, minutes = POUR_MIX_MINUTES_DEFAULT): boolean {
  return Math.abs(a.getTime() - b.getTime()) < minutes * MINUTE_MS
}

/** The facts about one pour that its warnings come from. */
export interface PourWarningFacts {
  /** the plaster model's warnings (temperature, consistency, set factor) */
  modelWarnings: string[]
  /** dwellWarning's text, or null */
  dwell: string | null
  /** pourBreakWarning's text, or null (a pour placed by hand with its mix in a shift break) */
  shiftBreak?: string | null
  /** codes of the other pours whose mix the same caster is gauging at the same time */
  casterClashes: { mouldCode: string; mixAt: Date }[]
  casterName?: string | null
  mould: { code: string; pulls: number; expectedPulls: number | null }
  /** non-void, not yet demoulded pours on the mould, this one included */
  mouldPlannedPours: number
  /** the lot, with its stock after every non-void pour using it, this one included; null when none */
  lot: { code: string; leftKg: number } | null
}

const kg = (v: number) => `${Math.round(v * 10) / 10} kg`

/**
 * Formatters by kind and zone, built once: building an Intl.DateTimeFormat loads the zone's
 * rules (about 1 ms on the 2-core development machine, Node 20), formatting with a built one
 * takes about 2 µs; the floor route and every pour move used to build several per request.
 */
const formatters = new Map<string, Intl.DateTimeFormat>()
function formatter(kind: 'day' | 'clock', timezone: string): Intl.DateTimeFormat {
  const key = `${kind} ${timezone}`
  let f = formatters.get(key)
  if (!f) {
    f = kind === 'day'
      ? new Intl.DateTimeFormat('en-CA', { timeZone: timezone, year: 'numeric', month: '2-digit', day: '2-digit' })
      : new Intl.DateTimeFormat('en-GB', { timeZone: timezone, hour: '2-digit', minute: '2-digit', hourCycle: 'h23' })
    formatters.set(key, f)
  }
  return f
}

const hhmm = (d: Date, timezone: string) => formatter('clock', timezone).format(d)

/** The warnings stored on a pour, in a stable order: plaster model, dwell, caster, mould life, lot. */
export function pourWarnings(f: PourWarningFacts, timezone: string): string[] {
  const out = [...f.modelWarnings]
  if (f.dwell) out.push(f.dwell)
  if (f.shiftBreak) out.push(f.shiftBreak)
  for (const c of f.casterClashes) {
    out.push(`${f.casterName ?? 'The caster'} is already gauging a mix for ${c.mouldCode} at ${hhmm(c.mixAt, timezone)}: two mixes at once.`)
  }
  const { expectedPulls, pulls, code } = f.mould
  if (expectedPulls !== null && pulls + f.mouldPlannedPours >= expectedPulls) {
    out.push(`Mould ${code} reaches its expected life with this pour (${pulls} pulls + ${f.mouldPlannedPours} planned ≥ ${expectedPulls}).`)
  }
  if (f.lot && f.lot.leftKg < 0) {
    out.push(`Lot ${f.lot.code} will not cover the plaster planned from it: ${kg(-f.lot.leftKg)} short.`)
  }
  return out
}

/** A lot as the requisition sees it; useBy 'YYYY-MM-DD' or null (no date: never out of date). */
export interface RequisitionLot {
  lotId: number
  lotCode: string
  receivedOn: string
  useBy: string | null
  stockKg: number
}

/**
 * The lot to open: first in, first out (common practice: plaster ages in the bag and sets
 * faster or unevenly when old), so the earliest received lot still in date on `day` with
 * stock left; ties by use-by then id. Null when no lot qualifies.
 */
export function lotToOpen(lots: RequisitionLot[], day: string): RequisitionLot | null {
  const usable = lots.filter(l => l.stockKg > 0 && (l.useBy === null || l.useBy >= day))
  usable.sort((a, b) => a.receivedOn.localeCompare(b.receivedOn)
    || (a.useBy ?? '9999').localeCompare(b.useBy ?? '9999') || a.lotId - b.lotId)
  return usable[0] ?? null
}

export interface RequisitionLine {
  gradeId: number
  gradeName: string
  plasterKg: number
  bags: number
  bagKg: number
  waterLitres: number
}

/** One grade's line of the day's requisition: whole bags (rounded up) and water in litres. */
export function requisitionLine(g: { gradeId: number; gradeName: string; bagKg: number }, pours: { plasterKg: number; waterKg: number }[]): RequisitionLine {
  const plasterKg = pours.reduce((s, p) => s + p.plasterKg, 0)
  const waterKg = pours.reduce((s, p) => s + p.waterKg, 0)
  return { ...g, plasterKg, bags: bagsForKg(plasterKg, g.bagKg), waterLitres: waterKg / MIX_WATER_DENSITY }
}

/** The local calendar date 'YYYY-MM-DD' of an instant in a timezone. */
export function boardLocalDay(at: Date, timezone: string): string {
  return formatter('day', timezone).format(at)
}

/** 'YYYY-MM-DD HH:MM' of an instant in a timezone, for messages. */
export function boardClock(at: Date, timezone: string, locale?: WorkshopLocale): string {
  return formatDateTime(at, timezone, locale)
}

const DAY_MS = 86_400_000

/**
 * The overnight-dwell warning of a pour: its shift is the last shift that started at or before
 * mixAt (a pour mixed before any shift has no shift to run over, so no warning), the next
 * shift is the first to start after that one ends; dwellWarning decides.
 */
export function pourDwellWarning(calendar: WorkshopShiftCalendar, t: { mixAt: Date; demouldOpenAt: Date; demouldCloseAt: Date }): string | null {
  const mix = t.mixAt.getTime()
  const windows = shiftWindows({ ...calendar, from: new Date(mix - 7 * DAY_MS), to: new Date(mix + 1) })
  const shift = windows.filter(w => w.start.getTime() <= mix).pop()
  if (!shift) return null
  return dwellWarning({
    demouldOpenAt: t.demouldOpenAt,
    demouldCloseAt: t.demouldCloseAt,
    shiftEndAt: shift.end,
    nextShiftStartAt: nextShiftStart(calendar, new Date(Math.max(shift.end.getTime(), mix))),
  })
}

/**
 * A pour placed by hand whose gauging [mixAt, mixAt + mixMinutes) touches a break of its shift:
 * the caster would be mixing on their break (the planner never does this; common practice: a
 * gauged mix cannot wait). Says the break and the first mix time after it; null when clear.
 */
export function pourBreakWarning(calendar: WorkshopShiftCalendar, mixAt: Date, timezone: string, mixMinutes = POUR_MIX_MINUTES_DEFAULT): string | null {
  const mix = mixAt.getTime()
  const end = mix + mixMinutes * MINUTE_MS
  for (const w of shiftWindows({ ...calendar, from: new Date(mix - DAY_MS), to: new Date(end + 1) })) {
    for (const b of w.breaks) {
      if (mix < b.end.getTime() && b.start.getTime() < end) {
        return `The mix at ${hhmm(mixAt, timezone)} runs into the ${hhmm(b.start, timezone)}–${hhmm(b.end, timezone)} break: mix at ${hhmm(b.end, timezone)} or before ${hhmm(new Date(b.start.getTime() - mixMinutes * MINUTE_MS), timezone)} instead.`
      }
    }
  }
  return null
}

/** The instant a local day 'YYYY-MM-DD' starts (local midnight) in a timezone. */
export function boardDayStart(day: string, timezone: string): Date {
  const [y, m, d] = day.split('-').map(Number) as [number, number, number]
  return DateTime.fromObject({ year: y, month: m, day: d }, { zone: timezone }).toJSDate()
}
