// Zod schemas of the pour board's routes (board, pours, shop days, planner, day sheet).
// Nuxt auto-imports every export of shared/utils, so the names carry a pour/board prefix.
import { z } from 'zod'
import { PLASTER_LIMITS, plasterRangeMessage } from './plaster-core'
import { CALENDAR_YEARS, PG_INTEGER_MAX, idText, isCalendarDay, isCalendarInstant } from './input-fields'

const bodyId = (field: string) => z.number({ error: `${field} must be a positive whole number` })
  .int({ error: `${field} must be a positive whole number` }).positive({ error: `${field} must be a positive whole number` })
/** The version the caller saw: an integer column. */
const version = bodyId('version').max(PG_INTEGER_MAX, { error: 'version is not one this pour has had' })

const boardDay = (field: string) => z.string({ error: `${field} must be a day as YYYY-MM-DD` })
  .regex(/^\d{4}-\d{2}-\d{2}$/, { error: `${field} must be a day as YYYY-MM-DD` })
  .refine(isCalendarDay, { error: `${field} must be a real calendar day from ${CALENDAR_YEARS.min} to ${CALENDAR_YEARS.max}` })
const instant = (field: string) => z.string({ error: `${field} must be an ISO date-time` })
  .refine(isCalendarInstant, { error: `${field} must be an ISO date-time from ${CALENDAR_YEARS.min} to ${CALENDAR_YEARS.max}` })
  .transform(v => new Date(v))

const consistency = z.number({ error: plasterRangeMessage('consistency', PLASTER_LIMITS.consistency) })
  .min(PLASTER_LIMITS.consistency.min, { error: plasterRangeMessage('consistency', PLASTER_LIMITS.consistency) })
  .max(PLASTER_LIMITS.consistency.max, { error: plasterRangeMessage('consistency', PLASTER_LIMITS.consistency) })
const setFactor = z.number({ error: plasterRangeMessage('setFactor', PLASTER_LIMITS.setFactor) })
  .gt(PLASTER_LIMITS.setFactor.min, { error: plasterRangeMessage('setFactor', PLASTER_LIMITS.setFactor) })
  .max(PLASTER_LIMITS.setFactor.max, { error: plasterRangeMessage('setFactor', PLASTER_LIMITS.setFactor) })

const DAY_MS = 86_400_000
/** Days from `from` to `to` inclusive. */
export function boardDaySpan(from: string, to: string) {
  return Math.round((Date.parse(`${to}T00:00:00Z`) - Date.parse(`${from}T00:00:00Z`)) / DAY_MS) + 1
}

/** The longest range the board and the planner read at once: a month. */
export const BOARD_MAX_DAYS = 31

/** from ≤ to and at most BOARD_MAX_DAYS days: keeps one board read bounded. */
export const boardRangeSchema = z.object({ from: boardDay('from'), to: boardDay('to') })
  .refine(v => v.from <= v.to, { path: ['to'], error: 'to must be on or after from' })
  .refine(v => boardDaySpan(v.from, v.to) <= BOARD_MAX_DAYS, { path: ['to'], error: `the range must be at most ${BOARD_MAX_DAYS} days` })

export const pourIdParamsSchema = z.object({ id: idText('id') })
export const shopDayParamsSchema = z.object({ day: boardDay('day') })
/** No day: the workshop's own today (its zone). */
export const daySheetQuerySchema = z.object({ day: boardDay('day').optional() })

export const pourCreateSchema = z.object({
  mouldId: bodyId('mouldId'),
  slotStart: instant('slotStart'),
  jobItemId: bodyId('jobItemId').optional(),
  casterId: bodyId('casterId').nullable().optional(),
  gradeId: bodyId('gradeId').optional(),
  consistency: consistency.optional(),
  setFactor: setFactor.optional(),
  lotId: bodyId('lotId').nullable().optional(),
  isSample: z.boolean({ error: 'isSample must be true or false' }).optional(),
})
export type PourCreateInput = z.infer<typeof pourCreateSchema>

export const pourMoveSchema = z.object({
  version,
  mouldId: bodyId('mouldId').optional(),
  slotStart: instant('slotStart').optional(),
  casterId: bodyId('casterId').nullable().optional(),
  consistency: consistency.optional(),
  setFactor: setFactor.optional(),
  lotId: bodyId('lotId').nullable().optional(),
})
export type PourMoveInput = z.infer<typeof pourMoveSchema>

export const pourVoidSchema = z.object({
  version,
  reason: z.string({ error: 'reason is required' }).trim().min(1, { error: 'reason is required' }).max(500, { error: 'reason must be at most 500 characters' }),
})

export const shopDaySchema = z.object({
  tempC: z.number({ error: 'tempC must be a number of °C' }).min(-10, { error: 'tempC must be between -10 and 45 °C' }).max(45, { error: 'tempC must be between -10 and 45 °C' }),
  humidityPct: z.number({ error: 'humidityPct must be a percentage' }).min(0, { error: 'humidityPct must be between 0 and 100' }).max(100, { error: 'humidityPct must be between 0 and 100' }),
})

export const plannerAcceptSchema = z.object({
  from: boardDay('from'),
  to: boardDay('to'),
  pours: z.array(z.object({
    jobItemId: bodyId('jobItemId'),
    mouldId: bodyId('mouldId'),
    slotStart: instant('slotStart'),
    casterId: bodyId('casterId').nullable().optional(),
  }), { error: 'pours must be a list' }).min(1, { error: 'pours must list at least one pour' }).max(2000, { error: 'pours must list at most 2000 pours' }),
}).refine(v => v.from <= v.to, { path: ['to'], error: 'to must be on or after from' })
  .refine(v => boardDaySpan(v.from, v.to) <= BOARD_MAX_DAYS, { path: ['to'], error: `the range must be at most ${BOARD_MAX_DAYS} days` })
