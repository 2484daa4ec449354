import { workshopsRepo } from '../../repos/workshops'
// The signed-in user as the server sees them now (role and name from the database).
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event)
  const ws = await workshopsRepo.get(useDb(), actor.workshopId)
  const workshop = ws && { name: ws.name, units: ws.units, timezone: ws.timezone, locale: ws.locale }
  return { id: actor.id, name: actor.name, email: actor.email, role: actor.role, home: ROLE_HOME[actor.role], workshop }
})
