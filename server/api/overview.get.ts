import { overviewRepo } from '../repos/overview'
// The lead's "today": open jobs by due date, moulds by state, today's pours by state.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  return overviewRepo.today(useDb(), actor.workshopId)
})
