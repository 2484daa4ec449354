import { updateGrade } from '../../services/catalogue'
// Edit or archive a plaster grade (lead); the body names the version it saw.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  const { id } = validParams(event, idParamSchema)
  const { version, ...input } = await validBody(event, gradePatchSchema)
  return updateGrade(actor.workshopId, id, version, input)
})
