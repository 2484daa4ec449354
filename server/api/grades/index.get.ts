import { listGrades } from '../../services/catalogue'
// Plaster grades with their calibration (staff read; casters need them for batch weights).
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, ...STAFF)
  return listGrades(actor.workshopId)
})
