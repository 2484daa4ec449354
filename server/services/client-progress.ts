// What a client's progress page shows: per item the counts planned, cast, fettled, dry and
// dispatched, when the job is expected ready to dispatch (only once every piece is planned:
// shared/utils/client-completion.ts), and the shared photos. Nothing internal: no casters, no
// defects, no notes.
import type { Actor } from '../utils/auth'
import { jobsRepo } from '../repos/jobs'
import { photosRepo } from '../repos/photos'
import { progressRepo } from '../repos/progress'
import { toClientPhotoDto } from './photos'
import { loadWorkshop, workshopCalendar } from './workshop'
import { calendarsRepo } from '../repos/calendars'
import { shopFallingRate } from '../queries/finishing-queue'
import { jobCompletion, type Completion } from '#shared/utils/client-completion'
import type { ClientProgressDto } from '#shared/types/photos'
import type { WorkshopLocale } from '#shared/utils/workshop-format'
import { castFromBatch } from '#shared/utils/plaster'
import { dryingThicknessMm, mouldCastFromRow, pieceMasses } from '#shared/utils/plaster-fibrous'
import { plasterGradeFromRow } from '#shared/utils/catalogue'
import { POUR_WASTE_PCT, boardLocalDay } from '#shared/utils/board-rules'
import { cachedRead } from '../utils/read-cache'
import { checkJobMember } from '../utils/session-checks'

/** A cast not yet out of the mould: its masses from the batch (less the board's waste allowance), as the demould step will. */
function plannedCast(c: { plaster_kg_planned: string | number; water_kg_planned: string | number; plaster_kg_actual: string | number | null; water_kg_actual: string | number | null } & Parameters<typeof plasterGradeFromRow>[0]) {
  const keep = 1 + POUR_WASTE_PCT / 100
  const cast = castFromBatch({
    plasterKg: Number(c.plaster_kg_actual ?? c.plaster_kg_planned) / keep, waterKg: Number(c.water_kg_actual ?? c.water_kg_planned) / keep, grade: plasterGradeFromRow(c),
  })
  return { wetMassKg: cast.wetMassKg, dryMassKg: cast.dryMassKg }
}

function completionDto(c: Completion, timezone: string, locale: WorkshopLocale): ClientProgressDto['completion'] {
  return c.kind === 'ready_by' ? { kind: c.kind, readyBy: c.at.toISOString(), timezone, locale } : c
}

/**
 * A client member's view of their job. The answer is the same for every member of the job, and
 * each of them reads it again on every live event of the job: so it is read once and shared for
 * a moment (server/utils/read-cache.ts, dropped on every change of the workshop), while whether
 * this person is a member is asked on every request, before anything is answered (with the
 * same turn's other checks, server/utils/session-checks.ts).
 */
export async function clientProgress(actor: Actor, jobId: number): Promise<ClientProgressDto> {
  if (!(await checkJobMember({ workshopId: actor.workshopId, jobId, userId: actor.id }))) notFound('Job')
  return cachedRead(actor.workshopId, `client-progress:${jobId}`, () => jobProgress(actor.workshopId, jobId))
}

async function jobProgress(workshopId: number, jobId: number): Promise<ClientProgressDto> {
  const db = useDb()
  const [job, items, casts, ws, photos, fallingRate] = await Promise.all([
    jobsRepo.byId(db, workshopId, jobId),
    progressRepo.items(db, workshopId, jobId),
    progressRepo.casts(db, workshopId, jobId),
    loadWorkshop(db, workshopId),
    photosRepo.forJob(db, workshopId, jobId, true),
    shopFallingRate(db, workshopId),
  ])
  // a member's job exists unless it was deleted since the membership check
  if (!job) notFound('Job')
  const closures = await calendarsRepo.closures(db, workshopId, boardLocalDay(new Date(), ws.timezone))
  const completion = jobCompletion({
    items: items.map(i => ({ piecesNeeded: i.pieces_needed, planned: i.planned })),
    // the drying room at the workshop's usual conditions (a plan days ahead has no shop day yet)
    // and the shop's own falling-rate factor, as a piece put to dry gets for its dry-by
    room: { tempC: Number(ws.default_shop_temp_c), humidityPct: Number(ws.default_humidity_pct), fallingRateFactor: fallingRate.factor },
    // fettling waits for people on shift: the workshop's days and hours, less its closures
    calendar: workshopCalendar(ws), closures: closures.map(c => ({ fromDay: c.from_day, toDay: c.to_day })),
    casts: casts.map((c) => {
      // a pour not yet demoulded: each of its pieces is its share of the batch (one per cavity)
      const mould = mouldCastFromRow(c)
      const mass = c.wet_mass_kg === null ? pieceMasses({ cast: plannedCast(c), mould }) : { wetMassKg: Number(c.wet_mass_kg), dryMassKg: Number(c.dry_mass_kg) }
      return {
        pieceState: c.piece_state, dryBy: c.dry_by, demouldedAt: c.demoulded_at, demouldOpenAt: c.demould_open_at, cavityLitres: Number(c.cavity_litres),
        thicknessMm: dryingThicknessMm(mould), ...mass,
      }
    }),
  })
  return {
    job: { id: job.id, code: job.code, title: job.title, dueOn: job.due_on },
    items: items.map(i => ({ id: i.id, description: i.description, piecesNeeded: i.pieces_needed, planned: i.planned, cast: i.cast, fettled: i.fettled, dry: i.dry, dispatched: i.dispatched })),
    expectedCompletionAt: completion.kind === 'ready_by' ? completion.at.toISOString() : null,
    completion: completionDto(completion, ws.timezone, ws.locale),
    photos: photos.map(toClientPhotoDto),
  }
}
