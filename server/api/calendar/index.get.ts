import { shopCalendar } from '../../services/calendars'
// The shop's closures and every caster's week (lead): what the planner plans around.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  return shopCalendar(actor.workshopId)
})
