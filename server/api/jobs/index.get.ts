import { listJobs } from '../../services/jobs'
// Every job of the workshop with item and member counts (staff read; clients use /api/client/jobs).
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, ...STAFF)
  return listJobs(actor.workshopId)
})
