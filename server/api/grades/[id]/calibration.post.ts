import { applyGradeCalibration } from '../../../services/catalogue'
// Apply a grade's live demould calibration, or withdraw it (lead). From then on the board,
// the planner and the mix card use the applied factor (appliedSetFactor, shared/utils/plaster-set.ts).
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  const { id } = validParams(event, idParamSchema)
  const { apply, version } = await validBody(event, gradeCalibrationApplySchema)
  return applyGradeCalibration(actor.workshopId, id, version, apply)
})
