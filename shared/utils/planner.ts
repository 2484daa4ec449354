/**
 * The planner: fills the pour board from open job items ("fill from open items").
 *
 * Greedy, earliest due date first, one pour per mould filling: a pour makes as many pieces as the
 * mould has cavities (plaster-fibrous.ts), so an item of 10 pieces on a 4-cavity mould takes 3
 * pours and counts 10 pieces planned (the 2 over are spares, not counted toward the item). Every mould keeps a free-time cursor
 * (the end of its last proposed pour) and its existing pours as a sorted interval list, so a
 * placement looks only forward from the cursor and never scans all pours: the run is about
 * O(pieces × moulds per item) plus the calendar. Rules, in the order they bite:
 * - items sorted by job due date (no date last), then job code, then item id;
 * - an item whose job waits for sample approval is not placed (reported in `unplaced`);
 * - moulds in repair or retired are never used; a mould stops once pulls + planned pours reach
 *   its expected life (reported in `moulds`);
 * - a pour never overlaps another pour on the same mould, existing or proposed (slots are
 *   half-open, like the tstzrange slots the database's exclusion constraint compares);
 * - prep starts at or after the shift start, gauging ends by the shift end, and the demould
 *   window opens by the shift end, unless the mould's max dwell holds the cast until the next
 *   shift starts (dwellWarning); such an overnight pour ends its slot at the next shift start +
 *   clean, since the cast comes out only then. Among an item's moulds a placement without that
 *   overnight note wins over one with it on the same shift day;
 * - no mix is gauged into a break of the shift (the workshop's shift breaks): a gauged mix
 *   cannot wait for the caster to come back (common practice), so a mix that would start in a
 *   break or run into one starts at the break's end instead;
 * - shop closures (holidays) have no shift; a day below 0 °C gets no pour and a day from 0 to
 *   5 °C a cold-day caution (a wet cast can freeze: common practice);
 * - with `casters` given, every pour books a caster at work for its whole gauging: inside their
 *   own days and hours (the workshop's unless set), never on an absence or a closure, and at
 *   most `maxMixes` mixes at once (default 1); when no caster is at work again before the
 *   horizon ends the pieces are reported as 'no-caster', in words;
 * - a bench with a mix limit gauges at most that many mixes at once across its moulds;
 * - an item's candidate moulds are the ones it names, then every mould of its profile and of
 *   the named moulds' profiles (identical moulds: common practice to cast a run from several);
 *   an item that names only a profile is planned on that profile's moulds;
 * - each piece goes on the item's mould where it can start earliest (same day: no overnight
 *   note first; then earliest prep start, earliest slot end, the item's mould order).
 * - a mould under mould work (being made, or away for repair with a return date) takes no pour
 *   before its available-from instant; a job that casts in it on that day says it waits for it;
 * - a job's date is when its last piece is ready to dispatch: the last demould plus the item's
 *   readyHours (fettling and drying from the drying model, given by the caller), not the demould;
 *   its fettleShiftHours (people's work) count in shift time (afterShiftTime), the drying round the clock.
 * The schedule runs on past `to` for `projectionDays` (default 365) to tell when late jobs
 * would finish; only pours starting before `to` are returned.
 *
 * Ids are strings (PostgreSQL bigints arrive as strings). Pure: no I/O, no framework import.
 */
import { DateTime } from 'luxon'
import type {
  PlanPoursInput, PlanPoursResult, PlannerDaySpan, PlannerItem, PlannerJobOutcome,
  PlannerMould, PlannerMouldNote, PlannerUnplaced, PlannerUnplacedReason, ProposedPour,
} from '../types/planner'
import {
  dwellWarning,
  pourSetMinutes,
  pourTimingAt,
  pourTimingOnMould,
  POUR_MIX_MINUTES_DEFAULT,
  type PourSetMinutes,
  type PourTimingMinutes,
} from './pour-timing'
import { assertPlanPoursInput } from './planner-input'
import { PLASTER_FREEZE_WARN_C } from './plaster-drying'
import { PlanningInputError, afterShiftTime, shiftWindows, type ShiftWindow } from './workshop-calendar'

const MINUTE_MS = 60_000
const DAY_MS = 86_400_000
const HOUR_MS = 3_600_000
const ceilMinute = (t: number) => Math.ceil(t / MINUTE_MS) * MINUTE_MS

interface Lane {
  mould: PlannerMould
  order: number
  cursor: number
  busyStart: number[]
  busyEnd: number[]
  busyPtr: number
  planned: number
  worn: boolean
  /** no pour starts before this (mould work); -Infinity when the mould is free now */
  availableFrom: number
}

interface Win {
  day: string
  start: number
  end: number
  /** the day's breaks as [start, end) instants in ms, in time order */
  breaks: [number, number][]
}

/** The end of the first break of the shift that the gauging [mixAt, mixEnd) would touch, or −1. */
function breakDuring(w: Win, mixAt: number, mixEnd: number): number {
  for (const [bs, be] of w.breaks) if (mixAt < be && bs < mixEnd) return be
  return -1
}

interface Placement {
  lane: Lane
  dayIndex: number
  slotStart: number
  mixAt: number
  slotEnd: number
  outDayIndex: number
  overnight: boolean
  casterId: string | null
  casterLane: number | null
  benchLane: number | null
  timing: PourTimingMinutes
  slurryTempC: number
  /** pieces this pour counts toward its item: the mould's cavities, at most what was left */
  pieces: number
}

interface Ctx {
  wins: Win[]
  winEnds: number[]
  earliest: number
  to: number
  setFactor: number
  pourMinutes: number
  casters: Book | null
  benches: Book | null
  /** set when a search found mould time but no caster at work for the rest of the horizon */
  casterShort: boolean
  tempOf: (day: string) => number
  /** per item × mould (itemIndex × mould count + mould order), then per slurry °C */
  timings: Map<number, Map<number, PourTimingMinutes>>
  /** per item, then per slurry °C */
  setMinutes: Map<number, Map<number, PourSetMinutes>>
  mouldCount: number
}

/** Lowest index ≥ lo whose end is after t (ends ascending). */
function firstEndAfter(ends: readonly number[], t: number, lo = 0): number {
  let hi = ends.length
  while (lo < hi) {
    const mid = (lo + hi) >> 1
    if (ends[mid]! > t) hi = mid
    else lo = mid + 1
  }
  return lo
}

/** Sorts and merges [start, end) intervals into parallel ascending arrays. */
function mergeIntervals(list: [number, number][]): { starts: number[]; ends: number[] } {
  const sorted = [...list].sort((a, b) => a[0] - b[0])
  const starts: number[] = []
  const ends: number[] = []
  for (const [s, e] of sorted) {
    const last = ends.length - 1
    if (last >= 0 && s < ends[last]!) ends[last] = Math.max(ends[last]!, e)
    else {
      starts.push(s)
      ends.push(e)
    }
  }
  return { starts, ends }
}

/** One lane of a Book: the busy intervals of one caster (or bench) copy, ascending and disjoint. */
interface BookLane {
  id: string
  starts: number[]
  ends: number[]
}

/**
 * Who or what gauges a mix: casters, or benches with a limit on mixes at once. Each id has as
 * many lanes as mixes it can gauge at once; a lane is busy during its mixes and, for a caster,
 * whenever they are not at work (off hours, days off, absences, closures), so "free for the
 * whole mix" also means "at work for the whole mix".
 */
class Book {
  private readonly lanes: BookLane[] = []
  private readonly byId = new Map<string, number[]>()

  /** Adds `copies` lanes for `id`: each blocked by `off`; each existing mix on the first lane it fits. */
  add(id: string, copies: number, off: [number, number][], mixes: [number, number][]): void {
    const first = this.lanes.length
    const merged = mergeIntervals(off)
    for (let c = 0; c < copies; c++) this.lanes.push({ id, starts: [...merged.starts], ends: [...merged.ends] })
    const own = Array.from({ length: copies }, (_, c) => first + c)
    this.byId.set(id, own)
    for (const [s, e] of [...mixes].sort((a, b) => a[0] - b[0])) {
      const free = own.find(l => this.freeAt(l, s, e - s) === s)
      if (free !== undefined) this.book(free, s, e)
      else {
        // an existing mix that fits no lane (the board allows it): kept on the first lane
        const lane = this.lanes[first]!
        const m = mergeIntervals([...lane.starts.map((x, i): [number, number] => [x, lane.ends[i]!]), [s, e]])
        lane.starts = m.starts
        lane.ends = m.ends
      }
    }
  }

  has(id: string): boolean {
    return this.byId.has(id)
  }

  /** The earliest start ≥ `start` at which the lane is free for `ms` (its intervals walked forward). */
  private freeAt(l: number, start: number, ms: number): number {
    const lane = this.lanes[l]!
    let s = start
    for (let i = firstEndAfter(lane.ends, start); i < lane.ends.length && lane.starts[i]! < s + ms; i++) {
      s = Math.max(s, lane.ends[i]!)
    }
    return s
  }

  /**
   * A lane (of `id`, or of any id) free for the whole [start, start + ms), or the earliest later
   * start at which one is (Infinity: none ever is, e.g. every caster absent to the horizon).
   */
  pick(start: number, ms: number, id?: string): { lane: number } | { retryAt: number } {
    let retryAt = Infinity
    const lanes = id === undefined ? this.lanes.map((_, i) => i) : (this.byId.get(id) ?? [])
    for (const l of lanes) {
      const s = this.freeAt(l, start, ms)
      if (s === start) return { lane: l }
      retryAt = Math.min(retryAt, s)
    }
    return { retryAt }
  }

  idOf(lane: number): string {
    return this.lanes[lane]!.id
  }

  book(l: number, start: number, end: number): void {
    const lane = this.lanes[l]!
    const i = firstEndAfter(lane.ends, start)
    lane.starts.splice(i, 0, start)
    lane.ends.splice(i, 0, end)
  }
}

const dayIn = (day: string, spans: readonly PlannerDaySpan[]) => spans.some(s => day >= s.fromDay && day <= s.toDay)

/**
 * Each caster's lanes: off whenever they are not at work. Their windows are the workshop's
 * calendar with their own days and hours, less their absences and the shop's closures.
 */
function casterBook(input: PlanPoursInput, casters: string[], shop: Win[], horizon: { from: Date; to: Date }, mixMs: number): Book {
  const book = new Book()
  const cals = input.options?.casterCalendars ?? {}
  const closures = input.closures ?? []
  for (const id of casters) {
    const c = cals[id] ?? {}
    // a caster on the shop's own days and hours shares its windows (already without closures)
    const own = c.workingDays || c.shiftStart || c.shiftEnd
      ? shiftWindows({
          timezone: input.calendar.timezone, shiftStart: c.shiftStart ?? input.calendar.shiftStart, shiftEnd: c.shiftEnd ?? input.calendar.shiftEnd,
          workingDays: c.workingDays ?? input.calendar.workingDays, ...horizon,
        }).filter(w => !dayIn(w.day, closures)).map((w): Win => ({ day: w.day, start: w.start.getTime(), end: w.end.getTime(), breaks: w.breaks.map(b => [b.start.getTime(), b.end.getTime()]) }))
      : shop
    const absences = c.absences ?? []
    const off: [number, number][] = []
    let last = -Infinity
    for (const w of own) {
      if (absences.length && dayIn(w.day, absences)) continue
      off.push([last, w.start])
      last = w.end
    }
    off.push([last, Infinity])
    const mixes = input.existingPours.filter(p => p.casterId === id && p.mixAt)
      .map((p): [number, number] => [p.mixAt!.getTime(), p.mixAt!.getTime() + mixMs])
    book.add(id, c.maxMixes ?? 1, off, mixes)
  }
  return book
}

/** Benches with a limit on mixes at once; the existing pours' mixes on their moulds taken first. */
function benchBook(input: PlanPoursInput, mixMs: number): Book | null {
  const limits = input.options?.benchMaxMixes ?? {}
  if (Object.keys(limits).length === 0) return null
  const benchOf = new Map(input.moulds.map(m => [m.id, m.benchId]))
  const book = new Book()
  for (const [id, n] of Object.entries(limits)) {
    const mixes = input.existingPours.filter(p => p.mixAt && benchOf.get(p.mouldId) === id)
      .map((p): [number, number] => [p.mixAt!.getTime(), p.mixAt!.getTime() + mixMs])
    book.add(id, n, [], mixes)
  }
  return book
}

/** End of the first existing pour on the lane that overlaps [start, end), or −1. */
function laneConflictEnd(lane: Lane, start: number, end: number): number {
  const i = firstEndAfter(lane.busyEnd, start, lane.busyPtr)
  return i < lane.busyEnd.length && lane.busyStart[i]! < end ? lane.busyEnd[i]! : -1
}

/** The plaster's timing of this item at this slurry temperature (cached: the model validates every call). */
function setMinutesFor(ctx: Ctx, item: PlannerItem, itemIndex: number, slurryTempC: number): PourSetMinutes {
  let byTemp = ctx.setMinutes.get(itemIndex)
  if (!byTemp) ctx.setMinutes.set(itemIndex, byTemp = new Map())
  let set = byTemp.get(slurryTempC)
  if (!set) {
    try {
      const setFactor = item.setFactor ?? ctx.setFactor
      set = pourSetMinutes({ grade: item.grade, consistency: item.consistency, slurryTempC, setFactor, pourMinutes: ctx.pourMinutes })
    }
    catch (e) {
      if (e instanceof PlanningInputError || !(e instanceof Error) || !('field' in e)) throw e
      throw new PlanningInputError(`items[${itemIndex}].${String(e.field)}`, e.message)
    }
    byTemp.set(slurryTempC, set)
  }
  return set
}

/** The pour's minute offsets for this item, mould and slurry temperature (cached per item × mould). */
function timingFor(ctx: Ctx, lane: Lane, item: PlannerItem, itemIndex: number, slurryTempC: number): PourTimingMinutes {
  const key = itemIndex * ctx.mouldCount + lane.order
  let byTemp = ctx.timings.get(key)
  if (!byTemp) ctx.timings.set(key, byTemp = new Map())
  let m = byTemp.get(slurryTempC)
  if (!m) byTemp.set(slurryTempC, m = pourTimingOnMould(setMinutesFor(ctx, item, itemIndex, slurryTempC), lane.mould))
  return m
}

type ShiftFit = Pick<Placement, 'slotStart' | 'mixAt' | 'slotEnd' | 'outDayIndex' | 'overnight'>

/**
 * Fits a pour whose prep starts at t (inside shift d) to the shift rules: the window opens by
 * the shift end; or else the gauging still ends inside the shift and the window still holds at
 * the next shift start (gauging is then put off, at the earliest, until the dwell reaches it).
 */
function fitInShift(ctx: Ctx, d: number, t: number, m: PourTimingMinutes): ShiftFit | null {
  const w = ctx.wins[d]!
  const mixAt = t + m.prepMinutes * MINUTE_MS
  const open = mixAt + m.openAfterMix * MINUTE_MS
  if (open <= w.end) return { slotStart: t, mixAt, slotEnd: open + m.cleanMinutes * MINUTE_MS, outDayIndex: d, overnight: false }
  const next = ctx.wins[d + 1]
  if (!next) return null
  const holdMix = Math.max(mixAt, ceilMinute(next.start - m.closeAfterMix * MINUTE_MS))
  if (holdMix + m.mixMinutes * MINUTE_MS > w.end) return null
  const holdOpen = holdMix + m.openAfterMix * MINUTE_MS
  const warning = dwellWarning({
    demouldOpenAt: new Date(holdOpen),
    demouldCloseAt: new Date(holdMix + m.closeAfterMix * MINUTE_MS),
    shiftEndAt: new Date(w.end),
    nextShiftStartAt: new Date(next.start),
  })
  const outAt = Math.max(holdOpen, next.start)
  if (warning || outAt > next.end) return null
  const slotStart = holdMix - m.prepMinutes * MINUTE_MS
  return { slotStart, mixAt: holdMix, slotEnd: outAt + m.cleanMinutes * MINUTE_MS, outDayIndex: d + 1, overnight: true }
}

/** The earliest placement of one piece of `item` on `lane` at or after its cursor, or null within the horizon. */
function earliestOnLane(ctx: Ctx, lane: Lane, item: PlannerItem, itemIndex: number): Placement | null {
  const wins = ctx.wins
  let t = ceilMinute(Math.max(lane.cursor, ctx.earliest, lane.availableFrom))
  let d = firstEndAfter(ctx.winEnds, t)
  while (d < wins.length) {
    const w = wins[d]!
    if (t < w.start) t = w.start
    const slurryTempC = ctx.tempOf(w.day)
    if (t >= w.end || slurryTempC < 0) {
      d++
      continue
    }
    const m = timingFor(ctx, lane, item, itemIndex, slurryTempC)
    const fit = fitInShift(ctx, d, t, m)
    if (!fit) {
      d++
      continue
    }
    const breakEnd = breakDuring(w, fit.mixAt, fit.mixAt + m.mixMinutes * MINUTE_MS)
    if (breakEnd >= 0) {
      // prep then runs on to the break's end (it always moves t forward: the mix was before it)
      t = Math.max(t + MINUTE_MS, ceilMinute(breakEnd - m.prepMinutes * MINUTE_MS))
      continue
    }
    const busyEnd = laneConflictEnd(lane, fit.slotStart, fit.slotEnd)
    if (busyEnd >= 0) {
      t = ceilMinute(busyEnd)
      continue
    }
    const mixMs = m.mixMinutes * MINUTE_MS
    const bench = lane.mould.benchId !== null && ctx.benches?.has(lane.mould.benchId)
      ? ctx.benches.pick(fit.mixAt, mixMs, lane.mould.benchId)
      : { lane: null }
    if ('retryAt' in bench) {
      t = ceilMinute(bench.retryAt - m.prepMinutes * MINUTE_MS)
      continue
    }
    const caster = ctx.casters?.pick(fit.mixAt, mixMs) ?? { lane: null }
    if ('retryAt' in caster) {
      if (caster.retryAt === Infinity) {
        ctx.casterShort = true
        return null
      }
      t = ceilMinute(caster.retryAt - m.prepMinutes * MINUTE_MS)
      continue
    }
    const casterId = caster.lane === null ? null : ctx.casters!.idOf(caster.lane)
    return { ...fit, lane, dayIndex: d, casterId, casterLane: caster.lane, benchLane: bench.lane, timing: m, slurryTempC, pieces: 0 }
  }
  return null
}

/** Same shift day first, then no overnight note, then earliest prep start, then earliest slot end. */
function betterPlacement(a: Placement, b: Placement): boolean {
  if (a.dayIndex !== b.dayIndex) return a.dayIndex < b.dayIndex
  if (a.overnight !== b.overnight) return !a.overnight
  if (a.slotStart !== b.slotStart) return a.slotStart < b.slotStart
  return a.slotEnd < b.slotEnd
}

/** Books the placement: moves the mould's cursor, counts the pull, books the caster. */
function commitPlacement(ctx: Ctx, p: Placement): void {
  const lane = p.lane
  lane.cursor = p.slotEnd
  lane.busyPtr = firstEndAfter(lane.busyEnd, lane.cursor, lane.busyPtr)
  lane.planned++
  const life = lane.mould.expectedPulls
  if (life !== null && lane.mould.pulls + lane.planned >= life) lane.worn = true
  const mixEnd = p.mixAt + p.timing.mixMinutes * MINUTE_MS
  if (p.casterLane !== null) ctx.casters!.book(p.casterLane, p.mixAt, mixEnd)
  if (p.benchLane !== null) ctx.benches!.book(p.benchLane, p.mixAt, mixEnd)
}

function toProposedPour(ctx: Ctx, item: PlannerItem, p: Placement): ProposedPour {
  const at = pourTimingAt(new Date(p.mixAt), p.timing)
  const m = p.lane.mould
  const warnings = [...at.warnings]
  if (p.slurryTempC < PLASTER_FREEZE_WARN_C) {
    warnings.push(`A cold day (${p.slurryTempC} °C in the shop): the set is slow and a wet cast can freeze. Warm the water and `
      + 'the shop or move the pour; follow your shop\'s cold-weather practice.')
  }
  if (p.overnight) {
    warnings.push(`The demould window opens after the shift ends; the cast stays in the mould until the shift of ${ctx.wins[p.outDayIndex]!.day} starts.`)
  }
  return {
    itemId: item.itemId,
    jobId: item.jobId,
    jobCode: item.jobCode,
    mouldId: m.id,
    mouldCode: m.code,
    benchId: m.benchId,
    casterId: p.casterId,
    day: ctx.wins[p.dayIndex]!.day,
    slotStart: at.slotStart,
    mixAt: at.mixAt,
    demouldOpenAt: at.demouldOpenAt,
    demouldCloseAt: at.demouldCloseAt,
    slotEnd: new Date(p.slotEnd),
    slurryTempC: p.slurryTempC,
    consistency: item.consistency,
    setFactor: item.setFactor ?? ctx.setFactor,
    overnight: p.overnight,
    pieces: p.pieces,
    warnings,
  }
}

/** What one item contributed: its placements in order, and the unplaced rest if any. */
interface ItemRun {
  item: PlannerItem
  placed: Placement[]
  unplaced: PlannerUnplaced | null
}

function unplacedOf(item: PlannerItem, reason: PlannerUnplacedReason, pieces: number, message: string): PlannerUnplaced {
  return { itemId: item.itemId, jobId: item.jobId, reason, pieces, message }
}

/**
 * After a commit, drops the remembered placements it spoils: the committed mould's, and any
 * that counted on the same caster or bench lane for an overlapping mix and finds no other one
 * free then (one that does just changes lane). The rest stay the earliest on their mould,
 * because a commit only ever takes mould, caster and bench time away.
 */
function forgetSpoiled(ctx: Ctx, known: Map<Lane, Placement | null>, done: Placement): void {
  known.delete(done.lane)
  if (done.casterLane === null && done.benchLane === null) return
  const end = done.mixAt + done.timing.mixMinutes * MINUTE_MS
  for (const [lane, p] of known) {
    if (!p) continue
    const ms = p.timing.mixMinutes * MINUTE_MS
    if (p.mixAt >= end || done.mixAt >= p.mixAt + ms) continue
    if (done.casterLane !== null && p.casterLane === done.casterLane) {
      const other = ctx.casters!.pick(p.mixAt, ms)
      if ('lane' in other) {
        p.casterLane = other.lane
        p.casterId = ctx.casters!.idOf(other.lane)
      }
      else {
        known.delete(lane)
        continue
      }
    }
    if (done.benchLane !== null && p.benchLane === done.benchLane) {
      const other = ctx.benches!.pick(p.mixAt, ms, p.lane.mould.benchId!)
      if ('lane' in other) p.benchLane = other.lane
      else known.delete(lane)
    }
  }
}

/**
 * Places the item's pieces one by one on the candidate mould where each starts earliest. Each
 * mould's earliest placement is remembered between pieces, so an item that many moulds cast
 * costs a comparison per mould and piece, not a search.
 */
function placeItem(ctx: Ctx, item: PlannerItem, itemIndex: number, lanes: Lane[]): ItemRun {
  const placed: Placement[] = []
  const known = new Map<Lane, Placement | null>()
  for (let left = item.piecesRemaining; left > 0;) {
    let best: Placement | null = null
    let usable = 0
    ctx.casterShort = false
    for (const lane of lanes) {
      if (lane.worn) continue
      usable++
      let p = known.get(lane)
      if (p === undefined) known.set(lane, p = earliestOnLane(ctx, lane, item, itemIndex))
      if (p && (!best || betterPlacement(p, best))) best = p
    }
    if (usable === 0) {
      const msg = `Every mould for this item has reached its expected life; ${left} piece(s) need a new or repaired mould.`
      return { item, placed, unplaced: unplacedOf(item, 'mould-life-reached', left, msg) }
    }
    if (!best && ctx.casterShort) {
      const msg = `No caster is at work when ${left} piece(s) could be cast: every caster is off, absent or busy to the end of `
        + 'the planning horizon. Check casters\' hours and absences, or add a caster.'
      return { item, placed, unplaced: unplacedOf(item, 'no-caster', left, msg) }
    }
    if (!best) {
      const msg = `No free mould time inside shift hours within the planning horizon for ${left} piece(s).`
      return { item, placed, unplaced: unplacedOf(item, 'no-slot-in-horizon', left, msg) }
    }
    commitPlacement(ctx, best)
    // one pour fills every cavity of its mould
    const pieces = Math.min(left, best.lane.mould.cavities ?? 1)
    left -= pieces
    placed.push({ ...best, pieces })
    forgetSpoiled(ctx, known, best)
  }
  return { item, placed, unplaced: null }
}

/** Digit-only ids compare as numbers (bigint ids), others as plain strings. */
function compareIds(a: string, b: string): number {
  if (/^\d+$/.test(a) && /^\d+$/.test(b) && a.length !== b.length) return a.length - b.length
  return a < b ? -1 : a > b ? 1 : 0
}

/** Earliest due date first (no date last), then job code, then item id. */
function compareItems(a: PlannerItem, b: PlannerItem): number {
  if (a.dueOn !== b.dueOn) {
    if (a.dueOn === null) return 1
    if (b.dueOn === null) return -1
    return a.dueOn < b.dueOn ? -1 : 1
  }
  if (a.jobCode !== b.jobCode) return a.jobCode < b.jobCode ? -1 : 1
  return compareIds(a.itemId, b.itemId)
}

function buildLanes(input: PlanPoursInput): Map<string, Lane> {
  const busy = new Map<string, [number, number][]>()
  for (const p of input.existingPours) {
    const list = busy.get(p.mouldId) ?? []
    list.push([p.slotStart.getTime(), p.slotEnd.getTime()])
    busy.set(p.mouldId, list)
  }
  const lanes = new Map<string, Lane>()
  input.moulds.forEach((mould, order) => {
    // a mould away for repair comes back on its return date; without one it is not planned
    if (mould.state === 'retired' || (mould.state === 'repair' && !mould.availableFrom)) return
    const { starts, ends } = mergeIntervals(busy.get(mould.id) ?? [])
    const worn = mould.expectedPulls !== null && mould.pulls >= mould.expectedPulls
    const availableFrom = mould.availableFrom ? mould.availableFrom.getTime() : -Infinity
    lanes.set(mould.id, { mould, order, cursor: -Infinity, busyStart: starts, busyEnd: ends, busyPtr: 0, planned: 0, worn, availableFrom })
  })
  return lanes
}

function buildCtx(input: PlanPoursInput): Ctx {
  const o = input.options ?? {}
  const from = input.from.getTime()
  const to = input.to.getTime()
  const projectionDays = o.projectionDays ?? 365
  const horizon = { from: input.from, to: new Date(to + projectionDays * DAY_MS) }
  const closures = input.closures ?? []
  // a closed day (holiday) has no shift: a cast held overnight waits for the next open one
  const wins = shiftWindows({ ...input.calendar, ...horizon })
    .filter(w => !dayIn(w.day, closures))
    .map((w: ShiftWindow): Win => ({ day: w.day, start: w.start.getTime(), end: w.end.getTime(), breaks: w.breaks.map(b => [b.start.getTime(), b.end.getTime()]) }))
  const pourMinutes = o.pourMinutes ?? POUR_MIX_MINUTES_DEFAULT
  const temps = input.shopTempByDay ?? {}
  const defaultTemp = input.defaultShopTempC ?? 20
  return {
    wins,
    winEnds: wins.map(w => w.end),
    earliest: Math.max(from, o.startAt?.getTime() ?? from),
    to,
    setFactor: o.setFactor ?? 1,
    pourMinutes,
    casters: o.casters?.length ? casterBook(input, o.casters, wins, horizon, pourMinutes * MINUTE_MS) : null,
    benches: benchBook(input, pourMinutes * MINUTE_MS),
    casterShort: false,
    tempOf: day => (Object.hasOwn(temps, day) ? temps[day]! : defaultTemp),
    timings: new Map(),
    setMinutes: new Map(),
    mouldCount: input.moulds.length,
  }
}

function mouldNotes(input: PlanPoursInput, lanes: Map<string, Lane>, named: Set<string>): PlannerMouldNote[] {
  const notes: PlannerMouldNote[] = []
  for (const m of input.moulds) {
    if (!named.has(m.id)) continue
    if ((m.state === 'repair' && !m.availableFrom) || m.state === 'retired') {
      notes.push({ mouldId: m.id, code: m.code, reason: m.state, message: `Mould ${m.code} is ${m.state === 'repair' ? 'in repair' : 'retired'}: not planned.` })
    }
    const lane = lanes.get(m.id)
    if (lane?.worn) {
      const message = `Mould ${m.code} reaches its expected life of ${m.expectedPulls} pulls `
        + `(${m.pulls} so far, ${lane.planned} planned): plan a remake.`
      notes.push({ mouldId: m.id, code: m.code, reason: 'expected-life', message })
    }
  }
  return notes
}

interface JobTally {
  out: PlannerJobOutcome
  readyAt: number
  waits: { at: number; code: string } | null
  complete: boolean
  inRange: boolean
  neverDries: boolean
}

/** The local date of an instant in the workshop's zone. */
const localDay = (t: number, zone: string) => DateTime.fromMillis(t, { zone }).toISODate()!

/**
 * Per job, in planning order: pieces planned before `to`, and when its last piece is ready to
 * dispatch: each cast's demould (the window's opening, or the next shift start for a cast held
 * overnight) plus its item's readyHours (fettling and drying, worked out by the caller from the
 * drying model), the latest of them.
 */
function summariseJobs(ctx: Ctx, runs: ItemRun[], zone: string): PlannerJobOutcome[] {
  const jobs = new Map<string, JobTally>()
  for (const { item, placed, unplaced } of runs) {
    let j = jobs.get(item.jobId)
    if (!j) {
      const out: PlannerJobOutcome = {
        jobId: item.jobId, jobCode: item.jobCode, dueOn: item.dueOn, piecesPlanned: 0, piecesRemaining: 0, finishesOn: null, onTime: false,
        projectedDate: null, readyAt: null, waitsFor: null, note: null,
      }
      j = { out, readyAt: -Infinity, waits: null, complete: true, inRange: true, neverDries: false }
      jobs.set(item.jobId, j)
    }
    j.out.piecesRemaining += item.piecesRemaining
    if (unplaced) j.complete = false
    if (item.readyHours === null && placed.length) j.neverDries = true
    for (const p of placed) {
      if (p.slotStart < ctx.to) j.out.piecesPlanned += p.pieces
      else j.inRange = false
      const demouldAt = p.slotEnd - p.timing.cleanMinutes * MINUTE_MS
      // fettling waits for the shift; past the horizon's windows it counts round the clock
      const fettleMs = Math.min(item.fettleShiftHours ?? 0, item.readyHours ?? 0) * HOUR_MS
      const fettled = afterShiftTime(ctx.wins, demouldAt, fettleMs) ?? demouldAt + fettleMs
      const ready = fettled + (item.readyHours ?? 0) * HOUR_MS - fettleMs
      if (ready > j.readyAt) j.readyAt = ready
      // the job waits for mould work when a cast goes in on the day its mould becomes free
      const free = p.lane.availableFrom
      if (free > ctx.earliest && p.slotStart < free + DAY_MS && (!j.waits || free > j.waits.at)) j.waits = { at: free, code: p.lane.mould.code }
    }
  }
  return [...jobs.values()].map(({ out, readyAt, waits, complete, inRange, neverDries }) => {
    // Nothing left to cast: on time, with no dates to report.
    if (out.piecesRemaining === 0) return { ...out, onTime: true }
    const waitsFor = waits ? { mouldCode: waits.code, availableOn: localDay(waits.at, zone) } : null
    if (neverDries) {
      return { ...out, waitsFor, note: 'The casts will not dry in the drying room\'s conditions: no date until the room is drier or warmer.' }
    }
    const dated = complete && readyAt > -Infinity
    const projectedDate = dated ? localDay(readyAt, zone) : null
    const finishesOn = dated && inRange ? projectedDate : null
    const onTime = projectedDate !== null && (out.dueOn === null || projectedDate <= out.dueOn)
    return { ...out, projectedDate, finishesOn, onTime, readyAt: dated ? new Date(readyAt) : null, waitsFor }
  })
}

/** The item's candidate mould ids: named first, then its profile's and its named moulds' profiles'. */
function candidateIds(item: PlannerItem, byId: Map<string, PlannerMould>, byProfile: Map<string, string[]>): string[] {
  const ids = [...item.mouldIds, ...(item.alternativeMouldIds ?? [])]
  const profiles = new Set<string>()
  if (item.profileId) profiles.add(item.profileId)
  for (const id of ids) {
    const p = byId.get(id)?.profileId
    if (p) profiles.add(p)
  }
  for (const p of profiles) ids.push(...(byProfile.get(p) ?? []))
  return [...new Set(ids)]
}

function runItem(ctx: Ctx, lanes: Map<string, Lane>, item: PlannerItem, index: number, named: Set<string>, ids: string[]): ItemRun {
  const pieces = item.piecesRemaining
  if (pieces === 0) return { item, placed: [], unplaced: null }
  if (item.depositReleased === false) {
    const msg = 'The job waits for deposit: its moulds are not started until the deposit is paid.'
    return { item, placed: [], unplaced: unplacedOf(item, 'deposit-awaiting', pieces, msg) }
  }
  if (!item.sampleReleased) {
    const msg = 'The job waits for the client to approve its sample cast; the run is not released to the board.'
    return { item, placed: [], unplaced: unplacedOf(item, 'sample-awaiting-approval', pieces, msg) }
  }
  item.mouldIds.forEach(id => named.add(id))
  item.alternativeMouldIds?.forEach(id => named.add(id))
  const candidates = ids.map(id => lanes.get(id)).filter((l): l is Lane => l !== undefined)
  if (candidates.length === 0) {
    const msg = item.mouldIds.length || item.alternativeMouldIds?.length
      ? 'None of the item\'s moulds can be used: unknown, in repair or retired.'
      : 'No mould of the item\'s profile can be used: none made yet, or all in repair or retired.'
    return { item, placed: [], unplaced: unplacedOf(item, 'no-usable-mould', pieces, msg) }
  }
  return placeItem(ctx, item, index, candidates)
}

/**
 * Fills the board from open job items; see the file header for the rules. Throws
 * PlanningInputError (or the plaster model's PlasterInputError) naming the first bad field.
 * `pours` are the proposed pours starting before `to`, in time order.
 */
export function planPours(input: PlanPoursInput): PlanPoursResult {
  assertPlanPoursInput(input)
  const ctx = buildCtx(input)
  const lanes = buildLanes(input)
  const order = input.items.map((item, index) => ({ item, index })).sort((a, b) => compareItems(a.item, b.item))
  const named = new Set<string>()
  const runs: ItemRun[] = []
  const pours: ProposedPour[] = []
  const byId = new Map(input.moulds.map(m => [m.id, m]))
  const byProfile = new Map<string, string[]>()
  for (const m of input.moulds) {
    if (m.profileId) byProfile.set(m.profileId, [...(byProfile.get(m.profileId) ?? []), m.id])
  }
  for (const { item, index } of order) {
    const run = runItem(ctx, lanes, item, index, named, candidateIds(item, byId, byProfile))
    runs.push(run)
    for (const p of run.placed) {
      if (p.slotStart < ctx.to) pours.push(toProposedPour(ctx, item, p))
    }
  }
  pours.sort((a, b) => a.slotStart.getTime() - b.slotStart.getTime() || compareIds(a.mouldId, b.mouldId))
  const unplaced = runs.flatMap(r => (r.unplaced ? [r.unplaced] : []))
  return { pours, jobs: summariseJobs(ctx, runs, input.calendar.timezone), unplaced, moulds: mouldNotes(input, lanes, named) }
}
