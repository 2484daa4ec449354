/**
 * Zod schemas for the plaster model's edge (routes and forms). The bounds and messages come
 * from PLASTER_LIMITS, and a final pass (once the fields themselves pass) runs the model's own grade check, so the schema and
 * `mixSummary` accept exactly the same input.
 */
import { z } from 'zod'
import {
  PLASTER_LIMITS,
  PlasterInputError,
  assertPlasterGrade,
  plasterRangeMessage,
  type PlasterLimit,
} from './plaster-core'

function limited(field: string, limit: PlasterLimit) {
  const message = plasterRangeMessage(field, limit)
  const base = z.number({ error: message }).max(limit.max, { error: message })
  return limit.minExclusive ? base.gt(limit.min, { error: message }) : base.gte(limit.min, { error: message })
}

/** A PlasterInputError field such as `grade.temperatureFactors[2][0]` as a zod path. */
function toPath(field: string): (string | number)[] {
  return field.split(/[.[\]]+/).filter(Boolean).map(part => (/^\d+$/.test(part) ? Number(part) : part))
}

const L = PLASTER_LIMITS
const temperaturePoint = z.tuple([
  limited('grade.temperatureFactors temperatures', L.temperatureFactorTempC),
  limited('grade.temperatureFactors multipliers', L.temperatureFactor),
], { error: 'grade.temperatureFactors entries must be [slurry °C, multiplier] pairs' })

/** Schema of a PlasterGrade, with the model's bounds and cross-checks (min ≤ default ≤ max, table at 20 °C). */
export const plasterGradeSchema = z.object({
  form: z.enum(['beta', 'alpha'], { error: 'grade.form must be \'beta\' or \'alpha\'' }),
  powderDensity: limited('grade.powderDensity', L.powderDensity),
  consistency: z.object({
    min: limited('grade.consistency.min', L.consistency),
    max: limited('grade.consistency.max', L.consistency),
    default: limited('grade.consistency.default', L.consistency),
  }, { error: 'grade.consistency must be an object with min, max and default' }),
  demouldMinutesRef: limited('grade.demouldMinutesRef', L.demouldMinutesRef),
  setTimeWaterExponent: limited('grade.setTimeWaterExponent', L.setTimeWaterExponent),
  temperatureFactors: z.array(temperaturePoint, { error: 'grade.temperatureFactors must be a list of pairs' })
    .min(1, { error: 'grade.temperatureFactors must list 1 to 50 [slurry °C, multiplier] points' })
    .max(50, { error: 'grade.temperatureFactors must list 1 to 50 [slurry °C, multiplier] points' }),
  hydrationHeat: limited('grade.hydrationHeat', L.hydrationHeat),
  setExpansionPct: limited('grade.setExpansionPct', L.setExpansionPct),
  purity: limited('grade.purity', L.purity),
}, { error: 'grade must be an object' }).superRefine((grade, ctx) => {
  try {
    assertPlasterGrade(grade, 'grade')
  }
  catch (e) {
    if (!(e instanceof PlasterInputError)) throw e
    // Paths are relative to the grade object; drop the leading "grade".
    ctx.addIssue({ code: 'custom', message: e.message, path: toPath(e.field).slice(1) })
  }
}, { when: payload => payload.issues.length === 0 })

/** Schema of mixSummary's input. wastePct defaults to 0 and setFactor to 1. */
export const mixInputSchema = z.object({
  cavityLitres: limited('cavityLitres', L.cavityLitres),
  grade: plasterGradeSchema,
  consistency: limited('consistency', L.consistency),
  wastePct: limited('wastePct', L.wastePct).default(0),
  waterTempC: limited('waterTempC', L.waterTempC),
  powderTempC: limited('powderTempC', L.powderTempC),
  shopTempC: limited('shopTempC', L.shopTempC),
  setFactor: limited('setFactor', L.setFactor).default(1),
  maxDwellMinutes: limited('maxDwellMinutes', L.maxDwellMinutes),
})

/** mixSummary's input as the schema outputs it (same shape as PlasterMixInput). */
export type MixInput = z.infer<typeof mixInputSchema>
