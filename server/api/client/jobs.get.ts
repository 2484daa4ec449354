import { clientJobs } from '../../services/jobs'
// The client's own jobs (member of), with item counts; nothing internal.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'client')
  return clientJobs(actor)
})
