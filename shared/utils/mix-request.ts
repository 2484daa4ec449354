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

/** The plaster_grades columns as the plaster model's PlasterGrade. */
export function plasterGradeFromRow(row: {
  form: 'beta' | 'alpha'
  powder_density: number
  consistency_min: number
  consistency_max: number
  consistency_default: number
  demould_minutes_ref: number
  set_time_water_exponent: number
  temperature_factors: [number, number][]
  hydration_heat: number
  set_expansion_pct: number
  purity: number
}) {
  return {
    form: row.form,
    powderDensity: Number(row.powder_density),
    consistency: { min: Number(row.consistency_min), max: Number(row.consistency_max), default: Number(row.consistency_default) },
    demouldMinutesRef: Number(row.demould_minutes_ref),
    setTimeWaterExponent: Number(row.set_time_water_exponent),
    temperatureFactors: row.temperature_factors.map(([t, f]) => [Number(t), Number(f)] as [number, number]),
    hydrationHeat: Number(row.hydration_heat),
    setExpansionPct: Number(row.set_expansion_pct),
    purity: Number(row.purity),
  }
}
