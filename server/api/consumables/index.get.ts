import { listConsumables } from '../../services/consumables'
// Consumables (scrim, laths, …) with their stock on hand (staff read).
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, ...STAFF)
  return listConsumables(actor.workshopId)
})
