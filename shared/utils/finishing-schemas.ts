// Zod schemas of the finisher's piece actions (POST /api/pieces/:id/actions) and of a dispatch
// note (POST /api/jobs/:id/dispatches), shared by the tablet's forms and the routes. Nuxt
// auto-imports every export of shared/utils, so the names carry a finishing prefix. The piece
// states, steps and words live in finishing-steps.ts, without zod, for the pages that only show them.
import { z } from 'zod'
import { FINISHING_ACTION_KINDS } from './finishing-steps'
import { PLASTER_DRYING_MAX_C } from './plaster-drying'
import { PLASTER_LIMITS, plasterRangeMessage } from './plaster-core'
import { CALENDAR_YEARS, isCalendarInstant } from './input-fields'

const positiveId = (field: string) => z.number({ error: `${field} must be a positive whole number` })
  .int({ error: `${field} must be a positive whole number` }).positive({ error: `${field} must be a positive whole number` })

// bounded like every instant a person enters (input-fields.ts): year 0 is no PostgreSQL year
const instantText = z.string({ error: 'at must be an ISO date-time' })
  .refine(isCalendarInstant, { error: `at must be an ISO date-time from ${CALENDAR_YEARS.min} to ${CALENDAR_YEARS.max}` })

const common = {
  actionId: z.uuid({ error: 'actionId must be a UUID' }),
  version: positiveId('version'),
  at: instantText.optional(),
}

const reason = z.string({ error: 'reason must be text' }).trim()
  .min(2, { error: 'reason is required: say what is wrong with the piece' }).max(300, { error: 'reason must be at most 300 characters' })

/** The 49 °C ceiling as a form message: the drying room is refused above it, not only warned about. */
const DRYING_TEMP_MESSAGE = `dryingTempC must be between 0 and ${PLASTER_DRYING_MAX_C} °C: above ${PLASTER_DRYING_MAX_C} °C set plaster starts to lose its combined water`
const dryingTemp = z.number({ error: DRYING_TEMP_MESSAGE }).min(0, { error: DRYING_TEMP_MESSAGE }).max(PLASTER_DRYING_MAX_C, { error: DRYING_TEMP_MESSAGE })
const humidity = z.number({ error: 'dryingHumidityPct must be between 0 and 100 %' })
  .min(0, { error: 'dryingHumidityPct must be between 0 and 100 %' }).max(100, { error: 'dryingHumidityPct must be between 0 and 100 %' })
const weighedKg = z.number({ error: plasterRangeMessage('weighedKg', PLASTER_LIMITS.weighedKg) })
  .gt(PLASTER_LIMITS.weighedKg.min, { error: plasterRangeMessage('weighedKg', PLASTER_LIMITS.weighedKg) })
  .max(PLASTER_LIMITS.weighedKg.max, { error: plasterRangeMessage('weighedKg', PLASTER_LIMITS.weighedKg) })
const notes = z.string({ error: 'notes must be text' }).trim().max(500, { error: 'notes must be at most 500 characters' }).optional()

export const finishingActionSchema = z.discriminatedUnion('kind', [
  z.object({ ...common, kind: z.literal('fettled'), dryingTempC: dryingTemp.optional(), dryingHumidityPct: humidity.optional() }),
  z.object({ ...common, kind: z.literal('weighed'), weighedKg }),
  z.object({ ...common, kind: z.literal('ready'), override: z.boolean({ error: 'override must be true or false' }).optional() }),
  z.object({ ...common, kind: z.literal('repair'), reason }),
  z.object({ ...common, kind: z.literal('repaired'), notes }),
  z.object({ ...common, kind: z.literal('rejected'), reason }),
  z.object({ ...common, kind: z.literal('packed') }),
  z.object({ ...common, kind: z.literal('fettle_start') }),
  z.object({ ...common, kind: z.literal('fettle_stop') }),
  z.object({ ...common, kind: z.literal('repair_start') }),
  z.object({ ...common, kind: z.literal('repair_stop') }),
], { error: `kind must be one of: ${FINISHING_ACTION_KINDS.join(', ')}` })
export type FinishingActionInput = z.infer<typeof finishingActionSchema>

/** The most pieces one dispatch note carries (a lorry load of casts is far fewer; a sanity bound). */
export const FINISHING_DISPATCH_MAX_PIECES = 500

export const finishingDispatchSchema = z.object({
  actionId: z.uuid({ error: 'actionId must be a UUID' }),
  pieceIds: z.array(positiveId('pieceIds'), { error: 'pieceIds must be a list of piece ids' })
    .min(1, { error: 'pieceIds must name at least one packed piece' })
    .max(FINISHING_DISPATCH_MAX_PIECES, { error: `pieceIds must name at most ${FINISHING_DISPATCH_MAX_PIECES} pieces` })
    .refine(ids => new Set(ids).size === ids.length, { error: 'pieceIds must not name a piece twice' }),
  notes,
  at: instantText.optional(),
})
export type FinishingDispatchInput = z.infer<typeof finishingDispatchSchema>
