// Enters a day's shop conditions (lead) and re-times that day's planned pours.
import { setShopDay } from '../../services/shop-days'

export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  const { day } = validParams(event, shopDayParamsSchema)
  const input = await validBody(event, shopDaySchema)
  return setShopDay(actor, day, input)
})
