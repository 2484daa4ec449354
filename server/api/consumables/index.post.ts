import { saveConsumable } from '../../services/consumables'
// A new consumable kept in stock (lead). A name the workshop already has is a 409.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  const input = await validBody(event, consumableCreateSchema)
  const consumable = await saveConsumable(actor.workshopId, null, input)
  setResponseStatus(event, 201)
  return consumable
})
