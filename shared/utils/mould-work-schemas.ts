// Shared zod schemas for mould work (lead): a mould being made or repaired, put whole.
import { z } from 'zod'
import { isCalendarDay } from './input-fields'
import { MOULD_WORK_STAGES } from './mould-work'

const HOURS_MESSAGE = 'hours must be a number of hours from 0 to 1000'
const day = (field: string) => z.string({ error: `${field} must be a date` }).refine(isCalendarDay, { error: `${field} must be a date` })

export const mouldWorkStageSchema = z.object({
  stage: z.enum(MOULD_WORK_STAGES, { error: 'stage must be model, running, case or mould' }),
  leadDays: z.number({ error: 'leadDays must be a whole number of days from 0 to 365' }).int({ error: 'leadDays must be a whole number of days from 0 to 365' })
    .min(0, { error: 'leadDays must be a whole number of days from 0 to 365' }).max(365, { error: 'leadDays must be a whole number of days from 0 to 365' }),
  done: z.boolean({ error: 'done must be true or false' }).default(false),
  // the hours the stage took, for the job's cost (job-cost.ts); a quarter of an hour is fine enough
  hours: z.number({ error: HOURS_MESSAGE }).min(0, { error: HOURS_MESSAGE }).max(1000, { error: HOURS_MESSAGE })
    .refine(v => Math.abs(Math.round(v * 100) - v * 100) < 1e-6, { error: 'hours may have at most two decimal places' }).optional(),
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
