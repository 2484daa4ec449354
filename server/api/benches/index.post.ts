import { createBench } from '../../services/catalogue'
// A new bench (lead).
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  const input = await validBody(event, benchCreateSchema)
  const bench = await createBench(actor.workshopId, input)
  setResponseStatus(event, 201)
  return bench
})
