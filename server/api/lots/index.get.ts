import { lotsWithStock } from '../../services/catalogue'
// Plaster lots with stock on hand and their warnings (staff read).
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, ...STAFF)
  return lotsWithStock(actor.workshopId)
})
