// Shared zod schemas for jobs, job items, client members and the sample decision. The job and
// sample states and their words are in job-words.ts, without zod, for the pages that only show them.
import { z } from 'zod'
import { PLASTER_LIMITS } from './plaster-core'
import { dayField, numberIn, optionalText, requiredText, versionField } from './catalogue-schemas'
import { idText } from './input-fields'
import { RUN_ENDS } from './plaster-cutlist'
import { JOB_STATES } from './job-words'

/** Default shortest piece in a run, m: shorter offcuts are hard to fix and to joint (common practice). */
export const DEFAULT_MIN_PIECE_M = 0.3

export const jobFields = z.object({
  code: requiredText('code', 40).regex(/^[\w.\-/ ]+$/, 'code may use letters, digits, spaces and . - / _'),
  title: requiredText('title', 160),
  site: optionalText('site', 300),
  dueOn: dayField('dueOn').nullable().optional(),
  notes: optionalText('notes', 4000),
  state: z.enum(JOB_STATES, { error: 'state must be open, on_hold, done or cancelled' }).optional(),
  sampleRequired: z.boolean({ error: 'sampleRequired must be true or false' }).optional(),
  clientOrgId: z.number({ error: 'clientOrgId must be a client' }).int().positive().max(Number.MAX_SAFE_INTEGER).nullable().optional(),
  siteId: z.number({ error: 'siteId must be a site' }).int().positive().max(Number.MAX_SAFE_INTEGER).nullable().optional(),
})
export const jobCreateSchema = jobFields
export const jobPatchSchema = jobFields.partial().extend({ version: versionField })

const L = PLASTER_LIMITS
const wallEnd = z.enum(RUN_ENDS, { error: 'a wall end must be square, internal, external or return' }).optional()
export const wallSchema = z.object({
  lengthM: numberIn('lengthM', L.wallLengthM.min, L.wallLengthM.max, 'm', { exclusive: true }),
  start: wallEnd,
  end: wallEnd,
}, { error: 'each wall must be an object with lengthM' })

/**
 * An item is either `pieces` (a quantity) or a `run` (walls through the run calculator; needs
 * a run mould with a cast length, checked by the server against the mould).
 */
export const jobItemFields = z.object({
  kind: z.enum(['pieces', 'run'], { error: 'kind must be pieces or run' }),
  mouldId: z.number({ error: 'mouldId must be a mould' }).int().positive().nullable().optional(),
  profile: optionalText('profile', 120),
  description: requiredText('description', 200),
  quantity: numberIn('quantity', 1, 10000, 'pieces', { int: true }).nullable().optional(),
  walls: z.array(wallSchema, { error: 'walls must be a list' }).min(1, 'walls must list at least one wall').max(200, 'walls must list at most 200 walls').nullable().optional(),
  minPieceM: numberIn('minPieceM', 0, 20, 'm').optional(),
  sparesPct: numberIn('sparesPct', 0, 100, '%').optional(),
  // the run calculator's corners (plaster-cutlist.ts): external mitres and returns need the projection
  projectionM: numberIn('projectionM', L.projectionM.min, L.projectionM.max, 'm', { exclusive: true }).nullable().optional(),
  sawCutM: numberIn('sawCutM', L.sawCutM.min, L.sawCutM.max, 'm').nullable().optional(),
  cornerBlockLegM: numberIn('cornerBlockLegM', L.cornerBlockLegM.min, L.cornerBlockLegM.max, 'm', { exclusive: true }).nullable().optional(),
  gradeId: z.number({ error: 'gradeId must be a plaster grade' }).int().positive().nullable().optional(),
  consistency: numberIn('consistency', L.consistency.min, L.consistency.max, 'parts water per 100 parts plaster').nullable().optional(),
  sortOrder: numberIn('sortOrder', 0, 10000, '', { int: true }).optional(),
})

type ItemShape = { kind?: 'pieces' | 'run'; quantity?: number | null; walls?: unknown[] | null; mouldId?: number | null; profile?: string | null }
function checkItem(v: ItemShape, ctx: z.RefinementCtx) {
  if (v.kind === 'pieces' && (v.quantity === undefined || v.quantity === null)) {
    ctx.addIssue({ code: 'custom', path: ['quantity'], message: 'quantity is required for an item in pieces' })
  }
  if (v.kind === 'run' && !v.walls?.length) {
    ctx.addIssue({ code: 'custom', path: ['walls'], message: 'walls are required for a run' })
  }
  if (v.kind === 'run' && !v.mouldId) {
    ctx.addIssue({ code: 'custom', path: ['mouldId'], message: 'a run needs its run mould (the cast length comes from it)' })
  }
  if (v.kind && !v.mouldId && !v.profile) {
    ctx.addIssue({ code: 'custom', path: ['mouldId'], message: 'choose a mould or name a profile' })
  }
}
export const jobItemCreateSchema = jobItemFields.superRefine(checkItem)
export const jobItemPatchSchema = jobItemFields.extend({ version: versionField }).superRefine(checkItem)

export const jobMemberInviteSchema = z.object({
  email: z.string({ error: 'email is required' }).trim().toLowerCase().max(254, 'email is too long').pipe(z.email({ message: 'email must be an e-mail address' })),
  name: optionalText('name', 120),
})

export const sampleMarkSchema = z.object({
  state: z.enum(['awaiting_cast', 'awaiting_approval'], { error: 'state must be awaiting_cast or awaiting_approval' }),
  version: versionField,
})

export const sampleDecisionSchema = z.object({
  decision: z.enum(['approved', 'changes_requested'], { error: 'decision must be approved or changes_requested' }),
  comment: optionalText('comment', 2000),
}).refine(v => v.decision === 'approved' || !!v.comment, { message: 'comment is required when you ask for changes', path: ['comment'] })

export const jobItemParamsSchema = z.object({ id: idText('id'), itemId: idText('itemId') })

export const jobMemberParamsSchema = z.object({ id: idText('id'), userId: idText('userId') })

export type JobItemCreateInput = z.infer<typeof jobItemCreateSchema>
