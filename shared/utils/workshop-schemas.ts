// The workshop's own settings (lead): display units, timezone, shift hours and breaks, working
// days, the usual shop conditions that drive demould windows when a day has none entered, and
// the heaviest crate it packs (stored in kg, typed in the units chosen beside it).
import { z } from 'zod'
import { PG_INTEGER_MAX } from './input-fields'
import { UNIT_LABELS, toDisplay, type UnitSystem } from './units-display'
import type { WorkshopLocale } from './workshop-format'

const hhmm = (field: string) => z.string().regex(/^([01]\d|2[0-3]):[0-5]\d$/, { error: `${field} must be a time as HH:MM` })

function isTimezone(tz: string) {
  try {
    new Intl.DateTimeFormat('en', { timeZone: tz })
    return true
  }
  catch {
    return false
  }
}

/**
 * A break in every working day's shift (tea, lunch), local wall clock. The planner starts no
 * mix that would run into one: a gauged mix cannot wait (common practice).
 */
export const shiftBreakSchema = z.object({
  start: z.string({ error: 'Break start is required' }).regex(/^([01]\d|2[0-3]):[0-5]\d$/, { error: 'Break start must be a time as HH:MM' }),
  end: z.string({ error: 'Break end is required' }).regex(/^([01]\d|2[0-3]):[0-5]\d$/, { error: 'Break end must be a time as HH:MM' }),
})
export type ShiftBreak = z.infer<typeof shiftBreakSchema>

/** Each break inside the shift, ending after it starts, none overlapping another (by position: "Break 2"). */
export function checkShiftBreaks(v: { shiftStart: string; shiftEnd: string; shiftBreaks?: ShiftBreak[] }, ctx: z.RefinementCtx) {
  const breaks = v.shiftBreaks ?? []
  breaks.forEach((b, i) => {
    const name = `Break ${i + 1}`
    if (b.end <= b.start) ctx.addIssue({ code: 'custom', path: ['shiftBreaks', i, 'end'], message: `${name} must end after it starts` })
    else if (b.start <= v.shiftStart || b.end >= v.shiftEnd) ctx.addIssue({ code: 'custom', path: ['shiftBreaks', i, 'start'], message: `${name} must fall inside the shift, ${v.shiftStart}–${v.shiftEnd}` })
    else if (breaks.some((o, j) => j !== i && o.start < b.end && b.start < o.end)) ctx.addIssue({ code: 'custom', path: ['shiftBreaks', i, 'start'], message: `${name} overlaps another break` })
  })
}

/**
 * The heaviest crate a workshop may set, kg: from 10 (below that a crate holds hardly one cast
 * and the team-lift mark at 25 kg already speaks for it) to 2000 (a common counterbalance
 * forklift's rated load; heavier loads are a haulier's plan, not a crate). Our choice, no source.
 * Packing over it warns and refuses nothing (server/services/deliveries.ts).
 */
export const CRATE_MAX_KG_RANGE = { min: 10, max: 2000 } as const

/**
 * The heaviest crate within CRATE_MAX_KG_RANGE, refused in the units the form shows (the body's
 * `units`): the bounds in lb are rounded inwards to one decimal, so a figure typed at the bound
 * shown is accepted.
 */
export function checkCrateMax(v: { units: UnitSystem; crateMaxKg?: number }, ctx: z.RefinementCtx) {
  if (v.crateMaxKg === undefined) return
  const { min, max } = CRATE_MAX_KG_RANGE
  if (v.crateMaxKg >= min && v.crateMaxKg <= max) return
  const lo = Math.ceil(toDisplay.mass(min, v.units) * 10) / 10
  const hi = Math.floor(toDisplay.mass(max, v.units) * 10) / 10
  ctx.addIssue({ code: 'custom', path: ['crateMaxKg'], message: `crateMaxKg must be between ${lo} and ${hi} ${UNIT_LABELS[v.units].mass}` })
}

/** The settings a workshop is created with (first-run set-up) and later edited with. */
export const workshopFields = {
  name: z.string().trim().min(1, { error: 'name is required' }).max(120, { error: 'name must be at most 120 characters' }),
  units: z.enum(['metric', 'imperial'], { error: 'units must be metric or imperial' }),
  timezone: z.string().refine(isTimezone, { error: 'timezone must be an IANA zone such as Europe/London' }),
  shiftStart: hhmm('shiftStart'),
  shiftEnd: hhmm('shiftEnd'),
  workingDays: z.array(z.number().int().min(1).max(7), { error: 'workingDays must list ISO weekdays 1 (Monday) to 7 (Sunday)' })
    .min(1, { error: 'workingDays must name at least one day' }).max(7),
  defaultShopTempC: z.number({ error: 'defaultShopTempC must be a number of °C' }).min(-10, { error: 'defaultShopTempC must be between -10 and 45 °C' }).max(45, { error: 'defaultShopTempC must be between -10 and 45 °C' }),
  shiftBreaks: z.array(shiftBreakSchema, { error: 'Breaks must be a list of start and end times' }).max(6, { error: 'At most 6 breaks a shift' }).default([]),
  defaultHumidityPct: z.number({ error: 'defaultHumidityPct must be a percentage' }).min(0, { error: 'defaultHumidityPct must be between 0 and 100' }).max(100, { error: 'defaultHumidityPct must be between 0 and 100' }),
  /** How days and numbers are written (shared/utils/workshop-format.ts); left out, a save keeps the workshop's own. */
  locale: z.enum(['en-GB', 'en-US'] as const satisfies readonly WorkshopLocale[], { error: 'locale must be English (UK) or English (US)' }).optional(),
  /** kg (the form converts from lb); its range in checkCrateMax; left out, a save keeps the workshop's own (250 kg when set up). */
  crateMaxKg: z.number({ error: 'crateMaxKg must be a number' }).optional(),
}

export const workshopSettingsSchema = z.object({
  version: z.number({ error: 'version must be the version you loaded' }).int().positive().max(PG_INTEGER_MAX, { error: 'version must be the version you loaded' }),
  ...workshopFields,
}).refine(v => v.shiftStart < v.shiftEnd, { path: ['shiftEnd'], error: 'shiftEnd must be after shiftStart' })
  .superRefine(checkShiftBreaks)
  .superRefine(checkCrateMax)

export type WorkshopSettings = z.infer<typeof workshopSettingsSchema>
