/**
 * Mould work as planned work: a new mould (take the model or a squeeze of the existing run,
 * run the profile or model the enrichment, make the case, make the rubber or plaster mould) or
 * a repair. Each stage has a lead time in working days; the mould is available from the working
 * day after its last stage ends, unless the lead gives the day (a repair's return date). The
 * stage names follow the usual order of the trade (common practice); the lead times are the
 * shop's own. Pure.
 */
import { z } from 'zod'
import { isCalendarDay } from './input-fields'

export const MOULD_WORK_STAGES = ['model', 'running', 'case', 'mould'] as const
export type MouldWorkStage = (typeof MOULD_WORK_STAGES)[number]

export const MOULD_WORK_STAGE_LABELS: Record<MouldWorkStage, string> = {
  model: 'Model or squeeze',
  running: 'Running or modelling',
  case: 'Case',
  mould: 'Mould',
}

export interface MouldWorkStageRow {
  stage: MouldWorkStage
  leadDays: number
  done: boolean
}

const DAY_MS = 86_400_000
const addDays = (day: string, n: number) => new Date(Date.parse(`${day}T00:00:00Z`) + n * DAY_MS).toISOString().slice(0, 10)
const weekday = (day: string) => new Date(`${day}T12:00:00Z`).getUTCDay() || 7

/**
 * The day a mould is available from: `startedOn` plus the lead days of the stages not done,
 * counted on the workshop's working days that are not closed; the mould is ready on the next
 * working day after the last one. No stage left: `startedOn` itself.
 */
export function mouldWorkAvailableFrom(input: {
  startedOn: string
  stages: readonly MouldWorkStageRow[]
  workingDays: readonly number[]
  closedDays?: readonly string[]
}): string {
  const left = input.stages.filter(s => !s.done).reduce((n, s) => n + s.leadDays, 0)
  const closed = new Set(input.closedDays ?? [])
  const open = (d: string) => input.workingDays.includes(weekday(d)) && !closed.has(d)
  let day = input.startedOn
  let counted = 0
  // bounded: a week without a working day would never end (the schemas forbid it; the bound is a guard)
  for (let guard = 0; counted < left && guard < 5000; guard++) {
    if (open(day)) counted++
    day = addDays(day, 1)
  }
  for (let guard = 0; !open(day) && guard < 14; guard++) day = addDays(day, 1)
  return day
}

const day = (field: string) => z.string({ error: `${field} must be a date` }).refine(isCalendarDay, { error: `${field} must be a date` })

export const mouldWorkStageSchema = z.object({
  stage: z.enum(MOULD_WORK_STAGES, { error: 'stage must be model, running, case or mould' }),
  leadDays: z.number({ error: 'leadDays must be a whole number of days from 0 to 365' }).int({ error: 'leadDays must be a whole number of days from 0 to 365' })
    .min(0, { error: 'leadDays must be a whole number of days from 0 to 365' }).max(365, { error: 'leadDays must be a whole number of days from 0 to 365' }),
  done: z.boolean({ error: 'done must be true or false' }).default(false),
}, { error: 'each stage must be an object with stage and leadDays' })

/**
 * A mould's work, put whole (lead). availableFrom left out is worked out from the stages;
 * a repair's return date is its availableFrom. state 'done' closes the work.
 */
export const mouldWorkPutSchema = z.object({
  kind: z.enum(['new', 'repair'], { error: 'kind must be new or repair' }),
  stages: z.array(mouldWorkStageSchema, { error: 'stages must be a list' }).max(8, { error: 'stages must list at most 8 stages' }),
  assignedTo: z.number({ error: 'assignedTo must be a person' }).int().positive().nullable().optional(),
  startedOn: day('startedOn'),
  availableFrom: day('availableFrom').nullable().optional(),
  state: z.enum(['open', 'done'], { error: 'state must be open or done' }).default('open'),
  notes: z.string({ error: 'notes must be text' }).trim().max(500, { error: 'notes must be at most 500 characters' }).transform(v => (v === '' ? null : v)).nullable().optional(),
}).refine(v => !v.availableFrom || v.availableFrom >= v.startedOn, { path: ['availableFrom'], error: 'availableFrom must not be before startedOn' })
  .refine(v => v.kind === 'repair' || v.stages.length > 0 || !!v.availableFrom, { path: ['stages'], error: 'a new mould needs its stages or an available-from date' })

export type MouldWorkPutInput = z.infer<typeof mouldWorkPutSchema>
