import { jobsRepo } from '../../repos/jobs'
// Edit a job (lead); the body names the version it saw. Turning the sample requirement on or
// off moves the sample state to "to be cast" or "not required" unless the client has decided.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  const { id } = validParams(event, idParamSchema)
  const { version, ...input } = await validBody(event, jobPatchSchema)
  const db = useDb()
  const job = await jobsRepo.byId(db, actor.workshopId, id)
  if (!job) notFound('Job')
  let sampleState: string | undefined
  if (input.sampleRequired === true && job.sample_state === 'not_required') sampleState = 'awaiting_cast'
  if (input.sampleRequired === false && job.sample_state !== 'approved') sampleState = 'not_required'
  return jobsRepo.update(db, actor.workshopId, id, version, { ...input, sampleState })
})
