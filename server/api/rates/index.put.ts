import { putRates } from '../../services/quotes'
// Replace the workshop's rates (lead); the body names the version it saw.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  const { version, ...input } = await validBody(event, ratesPutSchema)
  return putRates(actor.workshopId, version, input)
})
