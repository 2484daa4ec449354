// Zod schemas of the finisher's piece actions (POST /api/pieces/:id/actions) and of a dispatch
// note (POST /api/jobs/:id/dispatches), shared by the tablet's forms and the routes. Nuxt
// auto-imports every export of shared/utils, so the names carry a finishing prefix.
import { z } from 'zod'
import { CAST_DEFECTS } from './floor-schemas'
import { PLASTER_DRYING_MAX_C } from './plaster-drying'
import { PLASTER_LIMITS, plasterRangeMessage } from './plaster-core'
import { CALENDAR_YEARS, isCalendarInstant } from './input-fields'

export const FINISHING_PIECE_STATES = ['to_fettle', 'repair', 'drying', 'ready', 'packed', 'dispatched', 'rejected'] as const
export type FinishingPieceState = (typeof FINISHING_PIECE_STATES)[number]

/** The state words a finisher reads on a card. */
export const FINISHING_STATE_WORDS: Record<FinishingPieceState, string> = {
  to_fettle: 'To fettle', repair: 'In repair', drying: 'Drying', ready: 'Ready', packed: 'Packed', dispatched: 'Dispatched', rejected: 'Rejected',
}

/**
 * What is wrong with a cast when it goes to repair or is rejected: the same list the caster
 * picks from at demould (CAST_DEFECTS, floor-schemas.ts). The form offers these and free text beside them.
 */
export const FINISHING_REASONS = CAST_DEFECTS

export const FINISHING_ACTION_KINDS = ['fettled', 'weighed', 'ready', 'repair', 'repaired', 'rejected', 'packed',
  'fettle_start', 'fettle_stop', 'repair_start', 'repair_stop'] as const
export type FinishingActionKind = (typeof FINISHING_ACTION_KINDS)[number]

/**
 * The states a piece may be in for each action, and the state it moves to. A weighing leaves a
 * drying piece drying (it still moves the piece's version on, like every action, so a tablet's
 * queued chain can name the versions it will meet). Dispatching is not here: it happens to
 * several pieces at once through a dispatch note.
 */
export const FINISHING_STEPS: Record<FinishingActionKind, { from: readonly FinishingPieceState[]; to: FinishingPieceState }> = {
  fettled: { from: ['to_fettle'], to: 'drying' },
  weighed: { from: ['drying'], to: 'drying' },
  ready: { from: ['drying'], to: 'ready' },
  repair: { from: ['to_fettle', 'drying'], to: 'repair' },
  repaired: { from: ['repair'], to: 'to_fettle' },
  rejected: { from: ['repair', 'to_fettle', 'drying'], to: 'rejected' },
  packed: { from: ['ready'], to: 'packed' },
  // the finisher's clock for the job's cost: started and stopped on the piece, state unchanged
  fettle_start: { from: ['to_fettle'], to: 'to_fettle' },
  fettle_stop: { from: ['to_fettle'], to: 'to_fettle' },
  repair_start: { from: ['repair'], to: 'repair' },
  repair_stop: { from: ['repair'], to: 'repair' },
}

/** The timer steps: which work they time, and whether they start or stop it. */
export const FINISHING_TIMER_STEPS = {
  fettle_start: { work: 'fettle', start: true },
  fettle_stop: { work: 'fettle', start: false },
  repair_start: { work: 'repair', start: true },
  repair_stop: { work: 'repair', start: false },
} as const
export type FinishingTimerKind = keyof typeof FINISHING_TIMER_STEPS
export type FinishingTimerWork = 'fettle' | 'repair'

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
