import { getRates } from '../../services/quotes'
// The workshop's rates, margin, tax and deposit (lead: prices are the office's business).
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  return getRates(actor.workshopId)
})
