import { putMouldWork } from '../../../services/mould-works'
// A mould being made or repaired (lead): stages, who does it, the day it is available from.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  const { id } = validParams(event, idParamSchema)
  const input = await validBody(event, mouldWorkPutSchema)
  return putMouldWork(actor, id, input)
})
