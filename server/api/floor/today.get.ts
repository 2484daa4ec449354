import { floorToday } from '../../queries/floor-today'
// Today's pours as floor cards: a caster's own, a lead's all (or one caster's with ?casterId=).
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'caster', 'lead')
  const { casterId } = validQuery(event, floorTodayQuerySchema)
  return floorToday(actor, casterId)
})
