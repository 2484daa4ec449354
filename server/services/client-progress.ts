// What a client's progress page shows: per item the counts planned, cast, fettled, dry and
// dispatched, the expected completion from the board, and the shared photos. Nothing internal:
// no casters, no defects, no notes.
import type { Actor } from '../utils/auth'
import { jobsRepo } from '../repos/jobs'
import { photosRepo } from '../repos/photos'
import { progressRepo } from '../repos/progress'

export async function clientProgress(actor: Actor, jobId: number) {
  const db = useDb()
  const job = await jobsRepo.byId(db, actor.workshopId, jobId)
  if (!job || !(await jobsRepo.isMember(db, actor.workshopId, jobId, actor.id))) notFound('Job')
  const [items, expectedAt, photos] = await Promise.all([
    progressRepo.items(db, actor.workshopId, jobId),
    progressRepo.expectedCompletion(db, actor.workshopId, jobId),
    photosRepo.forJob(db, actor.workshopId, jobId, true),
  ])
  return {
    job: { id: job.id, code: job.code, title: job.title, due_on: job.due_on },
    items,
    expected_completion_at: expectedAt,
    photos: photos.map(p => ({ id: p.id, caption: p.caption, width: p.width, height: p.height, created_at: p.created_at })),
  }
}
