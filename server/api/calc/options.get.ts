// What the mix card offers: the workshop's grades and moulds, its units and usual shop
// temperature (any signed-in staff role).
import { mixOptions } from '../../services/calc'

export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, ...STAFF)
  return mixOptions(actor.workshopId)
})
