import { saveLot } from '../../services/catalogue'
// Receive a delivery of plaster (lead).
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  const input = await validBody(event, lotCreateSchema)
  const lot = await saveLot(actor.workshopId, null, input)
  setResponseStatus(event, 201)
  return lot
})
