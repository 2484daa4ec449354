import { updateItem } from '../../../../services/jobs'
// Replace an item's fields (lead); pieces are worked out again. The body names the version it saw.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  const { id, itemId } = validParams(event, jobItemParamsSchema)
  const input = await validBody(event, jobItemPatchSchema)
  return updateItem(actor, id, itemId, input)
})
