import { jobsRepo } from '../../../../repos/jobs'
// Take a client off the job (lead). Their account stays; they no longer see this job.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  const { id, userId } = validParams(event, jobMemberParamsSchema)
  const removed = await jobsRepo.removeMember(useDb(), actor.workshopId, id, userId)
  if (!removed) notFound('Job member')
  leaveJob(userId, id)
  setResponseStatus(event, 204)
  return null
})
