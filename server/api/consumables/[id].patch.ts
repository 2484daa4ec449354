import { saveConsumable } from '../../services/consumables'
// Correct or archive a consumable (lead); the body names the version it saw.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  const { id } = validParams(event, idParamSchema)
  const { version, ...input } = await validBody(event, consumablePatchSchema)
  return saveConsumable(actor.workshopId, { id, version }, input)
})
