import { addItem } from '../../../../services/jobs'
// Add an item to a job (lead): pieces of a mould or profile, or a run worked out from walls.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  const { id } = validParams(event, idParamSchema)
  const input = await validBody(event, jobItemCreateSchema)
  const row = await addItem(actor, id, input)
  setResponseStatus(event, 201)
  return row
})
