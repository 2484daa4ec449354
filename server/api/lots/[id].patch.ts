import { saveLot } from '../../services/catalogue'
// Correct or archive a lot (lead); the body names the version it saw.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  const { id } = validParams(event, idParamSchema)
  const { version, ...input } = await validBody(event, lotPatchSchema)
  return saveLot(actor.workshopId, { id, version }, input)
})
