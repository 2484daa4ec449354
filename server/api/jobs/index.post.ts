import { createJob } from '../../services/jobs'
// A new job (lead). A job that requires a sample starts with the sample to be cast.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  const input = await validBody(event, jobCreateSchema)
  const job = await createJob(actor.workshopId, input)
  setResponseStatus(event, 201)
  return job
})
