// Zod schemas of the casting register (GET /api/jobs/[id]/register and its CSV export) and of
// the quality figures (GET /api/quality). Days are the workshop's local calendar days.
import { z } from 'zod'
import { CALENDAR_YEARS, idText, isCalendarDay } from './input-fields'

const day = (field: string) => z.string({ error: `${field} must be a day as YYYY-MM-DD` })
  .regex(/^\d{4}-\d{2}-\d{2}$/, { error: `${field} must be a day as YYYY-MM-DD` })
  .refine(isCalendarDay, { error: `${field} must be a real calendar day from ${CALENDAR_YEARS.min} to ${CALENDAR_YEARS.max}` })
const intIn = (field: string, min: number, max: number) => z.coerce.number({ error: `${field} must be a whole number from ${min} to ${max}` })
  .int({ error: `${field} must be a whole number from ${min} to ${max}` })
  .min(min, { error: `${field} must be a whole number from ${min} to ${max}` }).max(max, { error: `${field} must be a whole number from ${min} to ${max}` })

const ordered = (q: { from?: string; to?: string }) => !q.from || !q.to || q.from <= q.to
const ORDER = { error: 'to must not be before from', path: ['to'] }

const filterShape = {
  from: day('from').optional(),
  to: day('to').optional(),
  result: z.enum(['sound', 'defect'], { error: 'result must be sound or defect' }).optional(),
  mould: idText('mould').optional(),
  caster: idText('caster').optional(),
}
export const registerFilterSchema = z.object(filterShape).refine(ordered, ORDER)
export type RegisterFilter = z.infer<typeof registerFilterSchema>

export const registerQuerySchema = z.object({
  ...filterShape,
  page: intIn('page', 1, 100_000).default(1),
  pageSize: intIn('pageSize', 1, 200).default(50),
}).refine(ordered, ORDER)

const YEAR_DAYS = 366
/** Whole-period figures read every pour of the period, so the period is at most a year. */
export const qualityQuerySchema = z.object({ from: day('from'), to: day('to') }).refine(ordered, ORDER)
  .refine(q => (Date.parse(q.to) - Date.parse(q.from)) / 86_400_000 < YEAR_DAYS, { error: `the period must be at most ${YEAR_DAYS} days`, path: ['to'] })
