import { jobsRepo } from '../../../repos/jobs'
import { jobItemsRepo } from '../../../repos/job-items'
// A job's items as CSV (lead).
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  const { id } = validParams(event, idParamSchema)
  const db = useDb()
  const job = await jobsRepo.byId(db, actor.workshopId, id)
  if (!job) notFound('Job')
  return sendCsv(event, `setline-${job.code}-items.csv`, jobItemsRepo.exportQuery(db, actor.workshopId, id), [
    { key: 'job', header: 'job' }, { key: 'description', header: 'item' }, { key: 'mould', header: 'mould' },
    { key: 'profile', header: 'profile' }, { key: 'quantity', header: 'quantity' }, { key: 'run_m', header: 'run m' },
    { key: 'spares_pct', header: 'spares %' }, { key: 'pieces_needed', header: 'pieces needed' },
    { key: 'grade', header: 'grade' }, { key: 'consistency', header: 'consistency' },
  ])
})
