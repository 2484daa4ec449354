// A job's items as CSV (lead); the run length in the workshop's units, the header naming it.
import { jobsRepo } from '../../../repos/jobs'
import { jobItemsRepo } from '../../../repos/job-items'
import { workshopsRepo } from '../../../repos/workshops'
import { UNIT_LABELS, displayNumber } from '#shared/utils/units-display'

export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  const { id } = validParams(event, idParamSchema)
  const db = useDb()
  const [job, ws] = await Promise.all([jobsRepo.byId(db, actor.workshopId, id), workshopsRepo.get(db, actor.workshopId)])
  if (!job) notFound('Job')
  const u = ws?.units ?? 'metric'
  const rows: Record<string, unknown>[] = await jobItemsRepo.exportQuery(db, actor.workshopId, id)
  return sendCsvRows(event, `setline-${job.code}-items.csv`, rows.map(r => ({
    ...r, run_m: r.run_m === null || r.run_m === undefined ? null : displayNumber('length', Number(r.run_m), u, u === 'imperial' ? 1 : 2),
  })), [
    { key: 'job', header: 'job' }, { key: 'description', header: 'item' }, { key: 'mould', header: 'mould' },
    { key: 'profile', header: 'profile' }, { key: 'quantity', header: 'quantity', number: true }, { key: 'run_m', header: `run (${UNIT_LABELS[u].length})`, number: true },
    { key: 'spares_pct', header: 'spares %', number: true }, { key: 'pieces_needed', header: 'pieces needed', number: true },
    { key: 'grade', header: 'grade' }, { key: 'consistency', header: 'consistency', number: true },
  ])
})
