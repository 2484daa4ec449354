// What a client's progress page shows: per item the counts planned, cast, fettled, dry and
// dispatched, the expected completion from the board, and the shared photos. Nothing internal:
// no casters, no defects, no notes.
import type { Actor } from '../utils/auth'
import { jobsRepo } from '../repos/jobs'
import { photosRepo } from '../repos/photos'
import { progressRepo } from '../repos/progress'
import { toClientPhotoDto } from './photos'
import type { ClientProgressDto } from '#shared/types/photos'

export async function clientProgress(actor: Actor, jobId: number): Promise<ClientProgressDto> {
  const db = useDb()
  const job = await jobsRepo.byId(db, actor.workshopId, jobId)
  if (!job || !(await jobsRepo.isMember(db, actor.workshopId, jobId, actor.id))) notFound('Job')
  const [items, expectedAt, photos] = await Promise.all([
    progressRepo.items(db, actor.workshopId, jobId),
    progressRepo.expectedCompletion(db, actor.workshopId, jobId),
    photosRepo.forJob(db, actor.workshopId, jobId, true),
  ])
  return {
    job: { id: job.id, code: job.code, title: job.title, dueOn: job.due_on },
    items: items.map(i => ({ id: i.id, description: i.description, piecesNeeded: i.pieces_needed, planned: i.planned, cast: i.cast, fettled: i.fettled, dry: i.dry, dispatched: i.dispatched })),
    expectedCompletionAt: expectedAt?.toISOString() ?? null,
    photos: photos.map(toClientPhotoDto),
  }
}
