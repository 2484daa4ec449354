import { clientProgress } from '../../../../services/client-progress'
// A client member's view of their job's progress: item counts, expected completion, shared photos.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'client')
  const { id } = validParams(event, idParamSchema)
  return clientProgress(actor, id)
})
