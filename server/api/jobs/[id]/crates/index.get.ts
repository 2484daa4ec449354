import { jobCrates } from '../../../../services/deliveries'
// A job's crates with their contents and weights, and the ready pieces still to pack.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead', 'finisher')
  const { id } = validParams(event, idParamSchema)
  return jobCrates(actor, id)
})
