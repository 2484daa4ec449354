import { receiveConsumable } from '../../../services/consumables'
// Stock of a consumable received (lead): a quantity in its unit, added to what is on hand.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  const { id } = validParams(event, idParamSchema)
  const input = await validBody(event, consumableReceiveSchema)
  return receiveConsumable(actor, id, input)
})
