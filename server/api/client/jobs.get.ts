import { jobsRepo } from '../../repos/jobs'
// The client's own jobs (member of), with item counts; nothing internal.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'client')
  return jobsRepo.forClient(useDb(), actor.workshopId, actor.id)
})
