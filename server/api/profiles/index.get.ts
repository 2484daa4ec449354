import { listProfiles } from '../../services/catalogue'
// Profiles by name with their mould counts (staff read): the mould and item forms offer them.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, ...STAFF)
  return listProfiles(actor.workshopId)
})
