import { overviewToday } from '../queries/overview'
// The lead's "today": open jobs by due date, moulds by state, today's pours by state.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  return overviewToday(actor.workshopId)
})
