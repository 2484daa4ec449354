import { updateJob } from '../../services/jobs'
// Edit a job (lead); the body names the version it saw. Turning the sample requirement on or
// off moves the sample state to "to be cast" or "not required" unless the client has decided.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  const { id } = validParams(event, idParamSchema)
  const { version, ...input } = await validBody(event, jobPatchSchema)
  return updateJob(actor.workshopId, id, version, input)
})
