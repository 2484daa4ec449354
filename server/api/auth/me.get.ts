import { workshopsRepo } from '../../repos/workshops'
import { workshopZoneOffsets } from '../../utils/zone-offsets'
// The signed-in user as the server sees them now (role and name from the database), with their
// workshop's settings and its zone's offsets (the pages write times without asking Intl).
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event)
  const ws = await workshopsRepo.get(useDb(), actor.workshopId)
  const workshop = ws && { name: ws.name, units: ws.units, timezone: ws.timezone, locale: ws.locale, zoneOffsets: workshopZoneOffsets(ws.timezone) }
  return { id: actor.id, name: actor.name, email: actor.email, role: actor.role, home: ROLE_HOME[actor.role], workshop }
})
