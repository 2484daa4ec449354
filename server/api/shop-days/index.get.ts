// The shop's entered temperature and humidity per day (staff); days without an entry use the
// workshop's defaults.
import { shopDaysRepo, shopDayDto } from '../../repos/shop-days'

export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, ...STAFF)
  const { from, to } = validQuery(event, boardRangeSchema)
  return (await shopDaysRepo.between(useDb(), actor.workshopId, from, to)).map(shopDayDto)
})
