// Shared zod schemas for the shop's calendar and the casters' weeks (lead): closures, each
// caster's days, hours, absences and mixes at once. Forms and routes validate with the same objects.
import { z } from 'zod'
import { isCalendarDay } from './input-fields'

const day = (field: string) => z.string({ error: `${field} must be a date` }).refine(isCalendarDay, { error: `${field} must be a date` })
const hhmm = (field: string) => z.string({ error: `${field} must be a time as HH:MM` })
  .regex(/^([01]\d|2[0-3]):[0-5]\d$/, { error: `${field} must be a time as HH:MM` })
const reason = z.string({ error: 'reason must be text' }).trim().max(200, { error: 'reason must be at most 200 characters' })
  .transform(v => (v === '' ? null : v)).nullable().optional()

/** A span of days, both ends included. */
export const daySpanSchema = z.object({ fromDay: day('fromDay'), toDay: day('toDay'), reason }, { error: 'each entry must be an object with fromDay and toDay' })
  .refine(v => v.toDay >= v.fromDay, { path: ['toDay'], error: 'toDay must not be before fromDay' })

/** The shop's closures as a whole list: the lead's page sends every one, and the list replaces the stored one. */
export const closuresPutSchema = z.object({
  closures: z.array(daySpanSchema, { error: 'closures must be a list' }).max(200, { error: 'closures must list at most 200 closures' }),
})

/** A caster's week: days and hours null follow the workshop's; absences replace the stored list. */
export const casterHoursSchema = z.object({
  workingDays: z.array(z.number({ error: 'workingDays must list ISO weekdays 1 (Monday) to 7 (Sunday)' }).int().min(1).max(7), { error: 'workingDays must list ISO weekdays 1 (Monday) to 7 (Sunday)' })
    .min(1, { error: 'workingDays must name at least one day' }).max(7).nullable(),
  shiftStart: hhmm('shiftStart').nullable(),
  shiftEnd: hhmm('shiftEnd').nullable(),
  maxMixes: z.number({ error: 'maxMixes must be a whole number from 1 to 4' }).int({ error: 'maxMixes must be a whole number from 1 to 4' })
    .min(1, { error: 'maxMixes must be a whole number from 1 to 4' }).max(4, { error: 'maxMixes must be a whole number from 1 to 4' }),
  absences: z.array(daySpanSchema, { error: 'absences must be a list' }).max(100, { error: 'absences must list at most 100 absences' }),
}).refine(v => !v.shiftStart || !v.shiftEnd || v.shiftStart < v.shiftEnd, { path: ['shiftEnd'], error: 'shiftEnd must be after shiftStart' })

export type CasterHoursInput = z.infer<typeof casterHoursSchema>
export type DaySpanInput = z.infer<typeof daySpanSchema>
