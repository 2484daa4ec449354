import { clientJobDetail } from '../../../services/jobs'
// One of the client's jobs as they may see it (no notes, no internal fields); anyone else's is a 404.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'client')
  const { id } = validParams(event, idParamSchema)
  return clientJobDetail(actor, id)
})
