import { mouldWork } from '../../../services/mould-works'
// The mould's open work, or its last one, or null (staff read).
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, ...STAFF)
  const { id } = validParams(event, idParamSchema)
  return mouldWork(actor.workshopId, id)
})
