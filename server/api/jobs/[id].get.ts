import { jobDetail } from '../../services/jobs'
// One job with its items, plan and client members (staff read; a client reads /api/client/jobs/:id).
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, ...STAFF)
  const { id } = validParams(event, idParamSchema)
  return jobDetail(actor, id)
})
