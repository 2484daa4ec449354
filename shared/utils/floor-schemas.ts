// Zod schemas of the floor's pour actions (start mixing, poured, demoulded), shared by the
// tablet's forms and POST /api/pours/:id/actions. Names carry a floor prefix (auto-imports).
// The steps and words the cards show live in floor-steps.ts, without zod: the floor page
// renders with those, and its action form loads this module when it opens.
import { z } from 'zod'
import { FLOOR_ACTION_KINDS, FLOOR_DEFECTS } from './floor-steps'
import { PLASTER_LIMITS, plasterRangeMessage } from './plaster-core'
import { CALENDAR_YEARS, PG_INTEGER_MAX, idText, isCalendarInstant } from './input-fields'

const ranged = (field: string, limit: { min: number; max: number; unit: string; minExclusive?: boolean }) => {
  const message = plasterRangeMessage(field, limit)
  const n = z.number({ error: message }).max(limit.max, { error: message })
  return limit.minExclusive ? n.gt(limit.min, { error: message }) : n.min(limit.min, { error: message })
}
const positiveId = (field: string) => z.number({ error: `${field} must be a positive whole number` })
  .int({ error: `${field} must be a positive whole number` }).positive({ error: `${field} must be a positive whole number` })

/** Shop air temperature on the floor: the range a workshop can be worked in (common practice). */
const shopTemp = z.number({ error: 'shopTempC must be a number of °C' })
  .min(-10, { error: 'shopTempC must be between -10 and 45 °C' }).max(45, { error: 'shopTempC must be between -10 and 45 °C' })

const common = {
  actionId: z.uuid({ error: 'actionId must be a UUID' }),
  version: positiveId('version').max(PG_INTEGER_MAX, { error: 'version is not one this pour has had' }),
  at: z.string({ error: 'at must be an ISO date-time' })
    .refine(isCalendarInstant, { error: `at must be an ISO date-time from ${CALENDAR_YEARS.min} to ${CALENDAR_YEARS.max}` })
    .optional(),
}

export const floorActionSchema = z.discriminatedUnion('kind', [
  z.object({
    ...common, kind: z.literal('start_mixing'),
    lotId: positiveId('lotId').nullable().optional(),
    waterTempC: ranged('waterTempC', PLASTER_LIMITS.waterTempC),
    powderTempC: ranged('powderTempC', PLASTER_LIMITS.powderTempC).optional(),
  }),
  z.object({
    ...common, kind: z.literal('poured'),
    plasterKg: ranged('plasterKg', PLASTER_LIMITS.plasterKg),
    waterKg: ranged('waterKg', PLASTER_LIMITS.waterKg),
    shopTempC: shopTemp,
    waterTempC: ranged('waterTempC', PLASTER_LIMITS.waterTempC).optional(),
  }),
  z.object({
    ...common, kind: z.literal('demoulded'),
    result: z.enum(['sound', 'defect'], { error: 'result must be sound or defect' }),
    defect: z.enum(FLOOR_DEFECTS, { error: `defect must be one of: ${FLOOR_DEFECTS.join(', ')}` }).optional(),
    notes: z.string({ error: 'notes must be text' }).trim().max(500, { error: 'notes must be at most 500 characters' }).optional(),
  }).refine(v => v.result === 'sound' || v.defect, { path: ['defect'], error: 'defect is required when the result is defect' }),
], { error: `kind must be one of: ${FLOOR_ACTION_KINDS.join(', ')}` })
export type FloorActionInput = z.infer<typeof floorActionSchema>

export const floorTodayQuerySchema = z.object({
  casterId: idText('casterId').optional(),
})
