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
    { key: 'profile', header: 'profile' }, { key: 'quantity', header: 'quantity', number: true }, { key: 'run_m', header: 'run m', number: true },
    { key: 'spares_pct', header: 'spares %', number: true }, { key: 'pieces_needed', header: 'pieces needed', number: true },
    { key: 'grade', header: 'grade' }, { key: 'consistency', header: 'consistency', number: true },
  ])
})
