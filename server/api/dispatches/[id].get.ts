import { dispatchNote } from '../../services/dispatches'
// One dispatch note as printed: the job, the pieces with marks and handling weights, the total.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead', 'finisher')
  const { id } = validParams(event, idParamSchema)
  return dispatchNote(actor, id)
})
