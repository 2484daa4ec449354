// A job's casting register, one page at a time (lead): every pour with its piece, filtered by
// local days (from, to), result, mould and caster. Also the moulds and casters to filter by.
import { jobsRepo } from '../../../repos/jobs'
import { registerRepo } from '../../../repos/register'

export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  const { id } = validParams(event, idParamSchema)
  const { page, pageSize, ...filter } = validQuery(event, registerQuerySchema)
  const db = useDb()
  const job = await jobsRepo.byId(db, actor.workshopId, id)
  if (!job) notFound('Job')
  const [{ rows, total }, choices] = await Promise.all([
    registerRepo.page(db, actor.workshopId, id, filter, page, pageSize),
    registerRepo.choices(db, actor.workshopId, id),
  ])
  return { job: { id: job.id, code: job.code, title: job.title }, page, pageSize, total, rows, ...choices }
})
