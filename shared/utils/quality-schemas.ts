// Shared zod schemas of the quality screen: a lead applying (or withdrawing) a grade's demould
// calibration. The form and the route validate with the same object.
import { z } from 'zod'
import { versionField } from './catalogue-schemas'

export const gradeCalibrationApplySchema = z.object({
  apply: z.boolean({ error: 'Apply must be true or false' }),
  version: versionField,
})
