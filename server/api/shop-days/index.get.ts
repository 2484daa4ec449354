// The shop's entered temperature and humidity per day (staff); days without an entry use the
// workshop's defaults.
import { shopDaysBetween } from '../../services/shop-days'

export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, ...STAFF)
  const { from, to } = validQuery(event, boardRangeSchema)
  return shopDaysBetween(actor.workshopId, from, to)
})
