// Shared zod schemas for the catalogue (plaster grades, lots, benches, moulds): the forms and
// the routes validate with the same objects, so a field's message is the same on both sides.
// A mould's materials and states with their words are in mould-words.ts, without zod (the board shows them).
import { z } from 'zod'
import { plasterGradeSchema } from './plaster-schema'
import { CALENDAR_YEARS, PG_INTEGER_MAX, isCalendarDay } from './input-fields'
import { MAX_MINOR } from './money'
import { CAST_TYPES, CONSUMABLE_UNITS, FIBROUS_LIMITS } from './plaster-fibrous'
import { MOULD_MATERIALS, MOULD_STATES } from './mould-words'

export const GRADE_PRESET_KEYS = ['beta-casting', 'beta-fibrous', 'alpha-casting'] as const

/** A required trimmed text of at most `max` characters, with the field name in each message. */
export function requiredText(field: string, max: number) {
  return z.string({ error: `${field} is required` }).trim().min(1, `${field} is required`).max(max, `${field} must be at most ${max} characters`)
}
/** Optional text: empty becomes null. */
export function optionalText(field: string, max: number) {
  return z.string({ error: `${field} must be text` }).trim().max(max, `${field} must be at most ${max} characters`)
    .transform(v => (v === '' ? null : v)).nullable().optional()
}
/** A number in [min, max] (or (min, max] when exclusive), with its unit in the message. */
export function numberIn(field: string, min: number, max: number, unit: string, opts: { int?: boolean; exclusive?: boolean } = {}) {
  const message = `${field} must be ${opts.exclusive ? `greater than ${min} and at most` : `between ${min} and`} ${max} ${unit}`.trim()
  let n = z.number({ error: message })
  if (opts.int) n = n.int({ error: `${field} must be a whole number` })
  n = opts.exclusive ? n.gt(min, { error: message }) : n.gte(min, { error: message })
  return n.max(max, { error: message })
}
/** A calendar day 'YYYY-MM-DD' (a real one, in CALENDAR_YEARS). */
export function dayField(field: string) {
  return z.string({ error: `${field} must be a date` }).regex(/^\d{4}-\d{2}-\d{2}$/, `${field} must be a date (YYYY-MM-DD)`)
    .refine(isCalendarDay, `${field} must be a real date from ${CALENDAR_YEARS.min} to ${CALENDAR_YEARS.max}`)
}
export const versionField = z.number({ error: 'version is required (the version you saw)' }).int('version must be a whole number').positive('version must be positive')
  .max(PG_INTEGER_MAX, 'version is not one this record has had')
const code = (field: string) => requiredText(field, 40).regex(/^[\w.\-/ ]+$/, `${field} may use letters, digits, spaces and . - / _`)

export const gradeFields = z.object({
  name: requiredText('name', 80),
  presetKey: z.enum(GRADE_PRESET_KEYS, { error: 'presetKey must be one of the presets' }).nullable().optional(),
  bagKg: numberIn('bagKg', 0, 100, 'kg', { exclusive: true }),
  notes: optionalText('notes', 2000),
  grade: plasterGradeSchema,
})
export const gradeCreateSchema = gradeFields
export const gradePatchSchema = gradeFields.partial().extend({
  archived: z.boolean({ error: 'archived must be true or false' }).optional(),
  version: versionField,
})

export const lotFields = z.object({
  gradeId: z.number({ error: 'gradeId is required' }).int().positive('gradeId is required'),
  lotCode: code('lotCode'),
  bagsReceived: numberIn('bagsReceived', 1, 10000, 'bags', { int: true }),
  bagKg: numberIn('bagKg', 0, 100, 'kg', { exclusive: true }),
  receivedOn: dayField('receivedOn'),
  useBy: dayField('useBy').nullable().optional(),
  notes: optionalText('notes', 2000),
  // what a bag of this lot cost, in the workshop currency's minor unit (money.ts); the job's cost prices plaster by it
  pricePerBag: z.number({ error: 'pricePerBag must be an amount' }).int('pricePerBag must be a whole number of pence or cents')
    .min(0, 'pricePerBag must not be negative').max(MAX_MINOR, 'pricePerBag is too large').nullable().optional(),
})
const useByAfterReceived = (v: { receivedOn?: string; useBy?: string | null }) => !v.useBy || !v.receivedOn || v.useBy >= v.receivedOn
export const lotCreateSchema = lotFields.refine(useByAfterReceived, { message: 'useBy must not be before receivedOn', path: ['useBy'] })
export const lotPatchSchema = lotFields.partial().extend({
  archived: z.boolean({ error: 'archived must be true or false' }).optional(),
  version: versionField,
}).refine(useByAfterReceived, { message: 'useBy must not be before receivedOn', path: ['useBy'] })

export const benchFields = z.object({
  name: requiredText('name', 60),
  kind: requiredText('kind', 60),
  lengthM: numberIn('lengthM', 0, 50, 'm', { exclusive: true }).nullable().optional(),
  sortOrder: numberIn('sortOrder', 0, 1000, '', { int: true }),
  /** mixes gauged on the bench at once (the planner keeps to it); null: no limit */
  maxMixes: numberIn('maxMixes', 1, 100, 'mixes', { int: true }).nullable().optional(),
})
export const benchCreateSchema = benchFields
export const benchPatchSchema = benchFields.partial().extend({
  archived: z.boolean({ error: 'archived must be true or false' }).optional(),
  version: versionField,
})

export const mouldFields = z.object({
  code: code('code'),
  casts: requiredText('casts', 200),
  material: z.enum(MOULD_MATERIALS, { error: 'material must be silicone, polyurethane, grp_case, plaster_piece or gelatine' }),
  benchId: z.number({ error: 'benchId must be a bench' }).int().positive().nullable().optional(),
  cavityLitres: numberIn('cavityLitres', 0, 1000, 'L', { exclusive: true }),
  castLengthM: numberIn('castLengthM', 0, 20, 'm', { exclusive: true }).nullable().optional(),
  prepMinutes: numberIn('prepMinutes', 0, 600, 'min', { int: true }),
  cleanMinutes: numberIn('cleanMinutes', 0, 600, 'min', { int: true }),
  maxDwellMinutes: numberIn('maxDwellMinutes', 0, 10080, 'min', { int: true }),
  pulls: numberIn('pulls', 0, 100000, 'pulls', { int: true }),
  expectedPulls: numberIn('expectedPulls', 1, 100000, 'pulls', { int: true }).nullable().optional(),
  profile: optionalText('profile', 120),
  cavities: numberIn('cavities', 1, FIBROUS_LIMITS.cavities.max, 'cavities', { int: true }).optional(),
  castType: z.enum(CAST_TYPES, { error: 'castType must be solid or fibrous' }).optional(),
  surfaceAreaM2: numberIn('surfaceAreaM2', 0, FIBROUS_LIMITS.surfaceAreaM2.max, 'm²', { exclusive: true }).nullable().optional(),
  shellThicknessMm: numberIn('shellThicknessMm', 0, FIBROUS_LIMITS.shellThicknessMm.max, 'mm', { exclusive: true }).nullable().optional(),
  /** what one cast uses of the workshop's consumables (replaces the mould's list when given) */
  consumables: z.array(z.object({
    consumableId: z.number({ error: 'consumableId must be a consumable' }).int().positive().max(Number.MAX_SAFE_INTEGER),
    quantityPerCast: numberIn('quantityPerCast', 0, FIBROUS_LIMITS.quantityPerCast.max, 'per cast', { exclusive: true }),
  }), { error: 'consumables must be a list' }).max(20, 'consumables must list at most 20').optional(),
})

/**
 * A fibrous mould needs its face's area and shell thickness (its plaster comes from them); a
 * solid one its cavity. For a fibrous mould the cavity may be left out: it is the shell's litres.
 */
function castNeeds(v: { castType?: string; cavityLitres?: number; surfaceAreaM2?: number | null; shellThicknessMm?: number | null }, ctx: z.RefinementCtx) {
  if (v.castType === 'fibrous') {
    if (v.surfaceAreaM2 == null) ctx.addIssue({ code: 'custom', path: ['surfaceAreaM2'], message: 'surfaceAreaM2 is required for a fibrous mould' })
    if (v.shellThicknessMm == null) ctx.addIssue({ code: 'custom', path: ['shellThicknessMm'], message: 'shellThicknessMm is required for a fibrous mould' })
  }
  else if (v.cavityLitres === undefined) ctx.addIssue({ code: 'custom', path: ['cavityLitres'], message: 'cavityLitres is required' })
}
export const mouldCreateSchema = mouldFields.extend({ cavityLitres: mouldFields.shape.cavityLitres.optional() }).superRefine(castNeeds)
export const mouldPatchSchema = mouldFields.partial().extend({ version: versionField })

/** A consumable kept in stock (hessian scrim, timber laths, …). */
export const consumableFields = z.object({
  name: requiredText('name', 80),
  unit: z.enum(CONSUMABLE_UNITS, { error: 'unit must be m2, m or each' }),
  kgPerUnit: numberIn('kgPerUnit', 0, FIBROUS_LIMITS.kgPerUnit.max, 'kg').nullable().optional(),
})
export const consumableCreateSchema = consumableFields
export const consumablePatchSchema = consumableFields.partial().extend({
  archived: z.boolean({ error: 'archived must be true or false' }).optional(),
  version: versionField,
})
/** Stock received: a positive quantity in the consumable's unit, with an optional note. */
export const consumableReceiveSchema = z.object({
  quantity: numberIn('quantity', 0, 1e6, '', { exclusive: true }),
  note: optionalText('note', 500),
})

export const profileCreateSchema = z.object({ name: requiredText('name', 120) })

/** A state change needs a reason when the mould leaves service (repair, retired). */
export const mouldStateSchema = z.object({
  state: z.enum(MOULD_STATES, { error: 'state must be ready, in_use, cleaning, repair or retired' }),
  reason: optionalText('reason', 500),
  version: versionField,
}).refine(v => !['repair', 'retired'].includes(v.state) || !!v.reason, { message: 'reason is required for repair or retirement', path: ['reason'] })

export type GradeCreateInput = z.infer<typeof gradeCreateSchema>
export type LotCreateInput = z.infer<typeof lotCreateSchema>
export type BenchCreateInput = z.infer<typeof benchCreateSchema>
export type MouldCreateInput = z.infer<typeof mouldCreateSchema>
