// Dispatch notes: a lead sends a job's packed pieces out on a numbered note (exactly once per
// actionId, so a double tap makes one note), and the note is read back for printing with the
// pieces' weights for handling.
//
// Who: a lead makes a note (it releases the client's goods and goes with the delivery the lead
// has arranged); finishers pack the pieces and read and print the notes, but do not make them.
// What goes: packed pieces only. "Ready" means dry; a piece leaves the shop packed, so the
// state order stays ready → packed → dispatched.
import type { Actor } from '../utils/auth'
import type { DispatchNoteDto, JobDispatchesDto } from '#shared/types/finishing'
import { FINISHING_TEAM_LIFT_KG } from '#shared/utils/finishing'
import type { FinishingDispatchInput } from '#shared/utils/finishing-schemas'
import { boardLocalDay } from '#shared/utils/board-rules'
import { jobsRepo } from '../repos/jobs'
import { piecesRepo } from '../repos/pieces'
import { dispatchesRepo } from '../repos/dispatches'
import { recordEvent } from '../repos/events'
import { actionTime, runOnce } from './actions'
import { loadWorkshop } from './workshop'
import { pieceDto } from '../queries/finishing-queue'

const round3 = (kg: number) => Math.round(kg * 1000) / 1000

/** POST /api/jobs/:id/dispatches: a note for the chosen packed pieces of the job. */
export function createDispatch(actor: Actor, jobId: number, input: FinishingDispatchInput) {
  return runOnce<{ id: number; noteNo: string; pieces: number }>(actor, input.actionId, { kind: 'dispatch.create', entityId: jobId }, async (trx) => {
    const job = await jobsRepo.byId(trx, actor.workshopId, jobId)
    if (!job) notFound('Job')
    const pieces = await piecesRepo.lockMany(trx, actor.workshopId, input.pieceIds)
    const found = new Set(pieces.map(p => p.id))
    const missing = input.pieceIds.find(id => !found.has(id))
    if (missing) unprocessable([{ field: 'pieceIds', message: `piece ${missing} was not found` }])
    const itemJobs = new Map<number | null, number | null>()
    for (const p of pieces) {
      if (!itemJobs.has(p.job_item_id)) itemJobs.set(p.job_item_id, await piecesRepo.jobIdOfItem(trx, actor.workshopId, p.job_item_id))
      if (itemJobs.get(p.job_item_id) !== jobId) unprocessable([{ field: 'pieceIds', message: `piece ${p.mark} is not a piece of ${job.code}` }])
      if (p.state !== 'packed') conflict(`Piece ${p.mark} is ${p.state.replace('_', ' ')}: only packed pieces go on a dispatch note`, { pieceId: p.id, state: p.state })
    }
    const ws = await loadWorkshop(trx, actor.workshopId)
    const { at, backdated } = actionTime(input.at, null)
    const noteNo = await dispatchesRepo.nextNoteNo(trx, ws.id, boardLocalDay(at, ws.timezone).slice(0, 4))
    const id = await dispatchesRepo.insert(trx, ws.id, { jobId, noteNo, at, by: actor.id, notes: input.notes || null })
    const ids = pieces.map(p => p.id)
    await piecesRepo.dispatch(trx, ws.id, ids, id)
    for (const p of pieces) {
      await recordEvent(trx, { workshopId: ws.id, entity: 'piece', entityId: p.id, type: 'piece.dispatched', actorId: actor.id, at, backdated, data: { from: 'packed', to: 'dispatched', mark: p.mark, dispatchId: id, noteNo } })
    }
    await recordEvent(trx, { workshopId: ws.id, entity: 'dispatch', entityId: id, type: 'dispatch.created', actorId: actor.id, at, backdated, data: { jobId, noteNo, pieceIds: ids } })
    return {
      result: { id, noteNo, pieces: ids.length },
      after: () => {
        emitToWorkshop(ws.id, { type: 'dispatch.created', id, row: { id, noteNo, jobId, pieceIds: ids } })
        emitToJob(ws.id, jobId, { type: 'job.progress', id: jobId })
      },
    }
  })
}

/** GET /api/jobs/:id/dispatches: the job's notes, and its packed pieces a new note can carry. */
export async function jobDispatches(actor: Actor, jobId: number): Promise<JobDispatchesDto> {
  const db = useDb()
  const job = await jobsRepo.byId(db, actor.workshopId, jobId)
  if (!job) notFound('Job')
  const [ws, notes, packed, readyCount] = await Promise.all([
    loadWorkshop(db, actor.workshopId),
    dispatchesRepo.ofJob(db, actor.workshopId, jobId),
    piecesRepo.ofJob(db, actor.workshopId, jobId, ['packed']),
    piecesRepo.countOfJob(db, actor.workshopId, jobId, 'ready'),
  ])
  return {
    timezone: ws.timezone,
    job: { id: Number(job.id), code: job.code, title: job.title },
    notes: notes.map(n => ({
      id: n.id, noteNo: n.note_no, dispatchedAt: new Date(n.dispatched_at).toISOString(), dispatchedBy: n.dispatched_by_name,
      pieces: n.pieces, totalKg: round3(Number(n.total_kg)),
    })),
    packed: packed.map(pieceDto),
    readyCount,
  }
}

/**
 * GET /api/dispatches/:id: the note as printed. A piece's weight is its last weighing (dry,
 * by the time it is packed) or else its computed dry mass, said which; over 25 kg it is marked
 * for two people or a lifting aid (FINISHING_TEAM_LIFT_KG).
 */
export async function dispatchNote(actor: Actor, id: number): Promise<DispatchNoteDto> {
  const db = useDb()
  const d = await dispatchesRepo.byId(db, actor.workshopId, id)
  if (!d) notFound('Dispatch note')
  const [ws, job, rows] = await Promise.all([
    loadWorkshop(db, actor.workshopId),
    dispatchesRepo.jobHeading(db, actor.workshopId, d.job_id),
    dispatchesRepo.pieces(db, actor.workshopId, id),
  ])
  const pieces = rows.map((r) => {
    const kg = round3(Number(r.weighed_kg ?? r.dry_mass_kg))
    return { id: r.id, mark: r.mark, item: r.item_description, mould: r.mould_code, kg, weighed: r.weighed_kg !== null, teamLift: kg > FINISHING_TEAM_LIFT_KG }
  })
  return {
    id: d.id, noteNo: d.note_no, dispatchedAt: new Date(d.dispatched_at).toISOString(), dispatchedBy: d.dispatched_by_name, notes: d.notes,
    timezone: ws.timezone, workshop: ws.name,
    job: { id: Number(job.id), code: job.code, title: job.title, site: job.site, client: job.client ?? null },
    pieces,
    totalKg: round3(pieces.reduce((t, p) => t + p.kg, 0)),
    teamLiftKg: FINISHING_TEAM_LIFT_KG,
  }
}
