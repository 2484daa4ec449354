// POST /api/calc/mix: the mix card's numbers for other tools. A caller names a grade of
// the workshop (gradeId) or sends a whole grade, and a mould (mouldId) or a cavity volume.
import { z } from 'zod'
import { mixInputSchema, plasterGradeSchema } from './plaster-schema'

const id = (field: string) => z.number({ error: `${field} must be a positive whole number` }).int({ error: `${field} must be a positive whole number` }).positive({ error: `${field} must be a positive whole number` })

export const mixRequestSchema = mixInputSchema
  .omit({ grade: true, cavityLitres: true, maxDwellMinutes: true })
  .extend({
    gradeId: id('gradeId').optional(),
    grade: plasterGradeSchema.optional(),
    mouldId: id('mouldId').optional(),
    cavityLitres: mixInputSchema.shape.cavityLitres.optional(),
    maxDwellMinutes: mixInputSchema.shape.maxDwellMinutes.optional(),
  })
  .superRefine((v, ctx) => {
    if (!v.grade && !v.gradeId) ctx.addIssue({ code: 'custom', path: ['gradeId'], message: 'gradeId (or a whole grade) is required' })
    if (v.cavityLitres === undefined && !v.mouldId) ctx.addIssue({ code: 'custom', path: ['cavityLitres'], message: 'cavityLitres (or mouldId) is required' })
  })

export type MixRequest = z.infer<typeof mixRequestSchema>
