import { jobDetail } from '../../services/jobs'
// One job with its items and plan. Staff see everything; a client member sees the client view
// (no notes, no internal fields); anyone else gets 404.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, ...EVERYONE)
  const { id } = validParams(event, idParamSchema)
  return jobDetail(actor, id)
})
