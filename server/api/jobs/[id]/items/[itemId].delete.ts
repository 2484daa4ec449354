import { removeItem } from '../../../../services/jobs'
// Remove an item that has no pours yet (lead).
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  const { id, itemId } = validParams(event, jobItemParamsSchema)
  await removeItem(actor, id, itemId)
  setResponseStatus(event, 204)
  return null
})
