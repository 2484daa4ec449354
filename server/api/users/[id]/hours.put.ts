import { setCasterWeek } from '../../../services/calendars'
// A caster's working days, hours, mixes at once and absences (lead); the planner books within them.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  const { id } = validParams(event, idParamSchema)
  const input = await validBody(event, casterHoursSchema)
  return setCasterWeek(actor, id, input)
})
