import { overviewToday } from '../queries/overview'
// The lead's Today: what needs the lead now, each line linking to where it is dealt with.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  return overviewToday(actor.workshopId)
})
