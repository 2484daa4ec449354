/**
 * The timing of one pour on one mould: when the mould is taken (prep start), when the caster
 * starts gauging, when the demould window opens and closes, and when the mould is free again.
 *
 * Timeline (the `slot` of a row in `pours` is slotStart .. slotEnd, half-open like tstzrange):
 *
 *   slotStart = mixAt − prep        the mould is cleaned of dust, released and set up
 *   mixAt                           the caster starts gauging (sifting, soaking, mixing)
 *   mixAt + pourMinutes             end of mixing: the plaster model's set clock starts here
 *   demouldOpenAt                   = end of mixing + demouldWindow().openMinutes, rounded up to a whole minute
 *   demouldCloseAt                  = demouldOpenAt + the mould's max dwell (demouldWindow's close = open + dwell)
 *   slotEnd = demouldOpenAt + clean the cast comes out as the window opens, then the mould is cleaned
 *
 * Units: instants are Dates; every duration is in minutes. Pure: no I/O, no framework import.
 */
import { PLASTER_LIMITS, assertPlasterNumber, type PlasterGrade } from './plaster-core'
import { demouldWindow } from './plaster-set'
import { PlanningInputError, assertPlanningDate } from './workshop-calendar'

/**
 * Minutes from the start of gauging to the end of mixing: 5. Sifting the powder onto the water
 * and letting it soak takes a minute or two, mixing two to three (common practice, no published
 * source; a fine casting plaster gives about 2–3 min of working time once it thickens). Pouring
 * happens after mixing, inside the set clock the plaster model already counts, so it is not
 * added again.
 */
export const POUR_MIX_MINUTES_DEFAULT = 5

const MINUTE_MS = 60_000

/** Prep and clean limits: a day at most, generous sanity bounds (common practice) that keep typos out. */
const MOULD_MINUTES_LIMIT = { min: 0, max: 1440, unit: 'min' } as const

/** The mould's part in a pour's timing; all minutes. */
export interface PourTimingMould {
  prepMinutes: number
  cleanMinutes: number
  maxDwellMinutes: number
}

/** What sets the clock of one pour. slurryTempC in °C; consistency in parts water per 100 plaster. */
export interface PourTimingSetInput {
  mould: PourTimingMould
  grade: PlasterGrade
  consistency: number
  slurryTempC: number
  setFactor?: number
  /** minutes from mixAt to the end of mixing; default POUR_MIX_MINUTES_DEFAULT */
  pourMinutes?: number
}

/** A pour's timing as offsets in whole minutes from mixAt (prep before it, the rest after it). */
export interface PourTimingMinutes {
  prepMinutes: number
  mixMinutes: number
  openAfterMix: number
  closeAfterMix: number
  cleanMinutes: number
  warnings: string[]
}

/** A pour's timing as instants, with the plaster model's warnings. */
export interface PourTiming {
  slotStart: Date
  mixAt: Date
  demouldOpenAt: Date
  demouldCloseAt: Date
  slotEnd: Date
  warnings: string[]
}

/** The plaster's part of a pour's timing, in minutes after mixAt; the same on any mould. */
export interface PourSetMinutes {
  mixMinutes: number
  openAfterMix: number
  warnings: string[]
}

/**
 * When the window opens, in whole minutes after mixAt: the model's demould-ready time after the
 * end of mixing, rounded UP (a board shows minutes, and a cast must never be called ready early).
 */
export function pourSetMinutes(input: Omit<PourTimingSetInput, 'mould'>): PourSetMinutes {
  if (typeof input !== 'object' || input === null) throw new PlanningInputError('input', 'input must be an object')
  const mix = assertPlasterNumber(input.pourMinutes ?? POUR_MIX_MINUTES_DEFAULT, 'pourMinutes', MOULD_MINUTES_LIMIT)
  const w = demouldWindow({
    grade: input.grade,
    consistency: input.consistency,
    slurryTempC: input.slurryTempC,
    setFactor: input.setFactor ?? 1,
    maxDwellMinutes: 0,
  })
  // The epsilon keeps a float like 35.000000001 from becoming 36.
  return { mixMinutes: mix, openAfterMix: Math.ceil(mix + w.openMinutes - 1e-9), warnings: w.warnings }
}

/**
 * A pour's minute offsets on a given mould: prep and clean rounded up to whole minutes, and
 * the window closing the mould's max dwell after it opens (whole minutes, rounded down: never
 * later than the mould allows). Offsets in whole minutes keep every instant of a pour on the
 * minute when mixAt is.
 */
export function pourTimingOnMould(set: PourSetMinutes, mould: PourTimingMould): PourTimingMinutes {
  if (typeof mould !== 'object' || mould === null) throw new PlanningInputError('mould', 'mould must be an object')
  const prep = assertPlasterNumber(mould.prepMinutes, 'mould.prepMinutes', MOULD_MINUTES_LIMIT)
  const clean = assertPlasterNumber(mould.cleanMinutes, 'mould.cleanMinutes', MOULD_MINUTES_LIMIT)
  const dwell = assertPlasterNumber(mould.maxDwellMinutes, 'mould.maxDwellMinutes', PLASTER_LIMITS.maxDwellMinutes)
  return {
    prepMinutes: Math.ceil(prep),
    mixMinutes: set.mixMinutes,
    openAfterMix: set.openAfterMix,
    closeAfterMix: set.openAfterMix + Math.floor(dwell),
    cleanMinutes: Math.ceil(clean),
    warnings: set.warnings,
  }
}

/** The timing as minute offsets from mixAt: pourSetMinutes on the mould (pourTimingOnMould). */
export function pourTimingMinutes(input: PourTimingSetInput): PourTimingMinutes {
  if (typeof input !== 'object' || input === null) throw new PlanningInputError('input', 'input must be an object')
  return pourTimingOnMould(pourSetMinutes(input), input.mould)
}

/** Instants of a pour from its mixAt and its minute offsets. */
export function pourTimingAt(mixAt: Date, m: PourTimingMinutes): PourTiming {
  const t = mixAt.getTime()
  const open = t + m.openAfterMix * MINUTE_MS
  return {
    slotStart: new Date(t - m.prepMinutes * MINUTE_MS),
    mixAt: new Date(t),
    demouldOpenAt: new Date(open),
    demouldCloseAt: new Date(t + m.closeAfterMix * MINUTE_MS),
    slotEnd: new Date(open + m.cleanMinutes * MINUTE_MS),
    warnings: [...m.warnings],
  }
}

/**
 * A pour's timing given when the caster starts gauging (mixAt). The demould window comes from
 * the plaster model's `demouldWindow` (minutes after the end of mixing); see the file header for
 * the timeline. Throws PlanningInputError / PlasterInputError naming a bad field.
 */
export function pourTiming(input: PourTimingSetInput & { mixAt: Date }): PourTiming {
  const mixAt = assertPlanningDate(input?.mixAt, 'mixAt')
  return pourTimingAt(mixAt, pourTimingMinutes(input))
}

/** The same timing given the prep start instead, e.g. where the lead drops a bar on the board. */
export function pourTimingFromSlotStart(input: PourTimingSetInput & { slotStart: Date }): PourTiming {
  const slotStart = assertPlanningDate(input?.slotStart, 'slotStart')
  const m = pourTimingMinutes(input)
  return pourTimingAt(new Date(slotStart.getTime() + m.prepMinutes * MINUTE_MS), m)
}

/**
 * The overnight-dwell rule. A window that opens by the end of the shift is fine: someone is
 * there to demould. A window that opens after the shift ends is fine only if the mould can
 * hold the set cast until the next shift starts, i.e. "hold" means demouldCloseAt ≥
 * nextShiftStartAt (the cast is still inside its max dwell when the first caster arrives).
 * Otherwise the cast overstays its dwell (a rigid or gelatine mould can be damaged, a cast can
 * stick or crack: common practice) and this returns the warning; else null.
 */
export function dwellWarning(input: {
  demouldOpenAt: Date
  demouldCloseAt: Date
  shiftEndAt: Date
  nextShiftStartAt: Date
}): string | null {
  const open = assertPlanningDate(input?.demouldOpenAt, 'demouldOpenAt').getTime()
  const close = assertPlanningDate(input.demouldCloseAt, 'demouldCloseAt').getTime()
  const shiftEnd = assertPlanningDate(input.shiftEndAt, 'shiftEndAt').getTime()
  const next = assertPlanningDate(input.nextShiftStartAt, 'nextShiftStartAt').getTime()
  if (open <= shiftEnd || close >= next) return null
  const shortBy = Math.ceil((next - close) / MINUTE_MS)
  return `The demould window opens after the shift ends and closes ${shortBy} min before the next shift starts: `
    + 'this mould cannot hold the cast overnight.'
}
