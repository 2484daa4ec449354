import { jobDispatches } from '../../../../services/dispatches'
// The job's dispatch notes and the packed pieces a new note can carry (lead and finisher).
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead', 'finisher')
  const { id } = validParams(event, idParamSchema)
  return jobDispatches(actor, id)
})
