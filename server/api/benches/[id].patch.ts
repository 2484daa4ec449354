import { updateBench } from '../../services/catalogue'
// Edit, reorder or archive a bench (lead); the body names the version it saw.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  const { id } = validParams(event, idParamSchema)
  const { version, ...input } = await validBody(event, benchPatchSchema)
  return updateBench(actor.workshopId, id, version, input)
})
