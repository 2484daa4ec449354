import { benchesRepo } from '../../repos/benches'
// A new bench (lead).
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  const input = await validBody(event, benchCreateSchema)
  const row = await benchesRepo.insert(useDb(), actor.workshopId, input)
  setResponseStatus(event, 201)
  return row
})
