// Planning, moving and voiding pours on the board: each use case in one transaction, the
// server the judge of every rule (pour-schemas.ts validates the shape, this the meaning).
import { gradeCalibrationFromRow } from '#shared/utils/catalogue'
import { appliedSetFactor } from '#shared/utils/plaster-set'
import type { Knex } from 'knex'
import type { Actor } from '../utils/auth'
import type { PourMoveInput } from '#shared/utils/pour-schemas'
import type { PourDto } from '#shared/types/board'
import { poursRepo, pourFactsRepo, type PourDtoRow, type PourWrite } from '../repos/pours'
import { shopDaysRepo } from '../repos/shop-days'
import type { WorkshopRow } from '../repos/workshops'
import { loadWorkshop, workshopCalendar } from './workshop'
import { batchForCavity } from '#shared/utils/plaster'
import { mouldCastFromRow, pourLitres } from '#shared/utils/plaster-fibrous'
import { pourTimingFromSlotStart } from '#shared/utils/pour-timing'
import { missedStartWarning, pourSituation } from '#shared/utils/pour-status'
import { inUnits } from '#shared/utils/units-display'
import { workshopLocale } from '#shared/utils/workshop-format'
import {
  POUR_WASTE_PCT, boardClock, boardLocalDay, mixesOverlap, pourBreakWarning, pourDwellWarning, pourOverdue, pourWarnings,
} from '#shared/utils/board-rules'

/** A pour as every route and live event sends it (the one declared PourDto, shared/types/board.ts). */
export function pourDto(r: PourDtoRow, now = new Date()): PourDto {
  const situation = pourSituation({ state: r.state, mixAt: r.mix_at, demouldOpenAt: r.demould_open_at, demouldCloseAt: r.demould_close_at }, now)
  return {
    id: r.id, version: r.version, mouldId: r.mould_id, mouldCode: r.mould_code,
    jobItemId: r.job_item_id, jobId: r.job_id, jobCode: r.job_code, itemDescription: r.item_description,
    casterId: r.caster_id, casterName: r.caster_name, gradeId: r.grade_id, gradeName: r.grade_name, lotId: r.lot_id,
    state: r.state, isSample: r.is_sample, consistency: Number(r.consistency), setFactor: Number(r.set_factor),
    slotStart: r.slot_start.toISOString(), slotEnd: r.slot_end.toISOString(), mixAt: r.mix_at.toISOString(),
    demouldOpenAt: r.demould_open_at.toISOString(), demouldCloseAt: r.demould_close_at.toISOString(),
    plasterKg: Number(r.plaster_kg_planned), waterKg: Number(r.water_kg_planned),
    warnings: [...(situation === 'missed_start' ? [missedStartWarning(r.mix_at, r.timezone, workshopLocale(r.locale))] : []), ...r.warnings.map(w => inUnits(w, r.units))],
    overdue: pourOverdue({ state: r.state, demouldCloseAt: r.demould_close_at }, now),
    situation,
  }
}

/** What a pour is planned from; absent fields default from the job item, then the grade. */
export interface PourPlanInput {
  mouldId: number
  slotStart: Date
  jobItemId?: number | null
  casterId?: number | null
  gradeId?: number | null
  consistency?: number | null
  setFactor?: number | null
  lotId?: number | null
  isSample?: boolean
}

const field422 = (field: string, message: string) => unprocessable([{ field, message }])

async function loadNamed(trx: Knex, ws: number, p: PourPlanInput) {
  const mould = await pourFactsRepo.mould(trx, ws, p.mouldId)
  if (!mould) field422('mouldId', 'is not a mould of this workshop')
  const item = p.jobItemId ? await pourFactsRepo.item(trx, ws, p.jobItemId) : null
  if (p.jobItemId && !item) field422('jobItemId', 'is not a job item of this workshop')
  const caster = p.casterId ? await pourFactsRepo.caster(trx, ws, p.casterId) : null
  if (p.casterId && !caster) field422('casterId', 'is not an active caster or lead of this workshop')
  const grade = await pourFactsRepo.grade(trx, ws, p.gradeId ?? item?.grade_id)
  if (!grade) field422('gradeId', p.gradeId ? 'is not one of this workshop\'s grades' : 'the workshop has no plaster grade yet')
  const lot = p.lotId ? await pourFactsRepo.lot(trx, ws, p.lotId) : null
  if (p.lotId && !lot) field422('lotId', 'is not a plaster lot of this workshop')
  if (lot && lot.grade_id !== grade.id) field422('lotId', `is a lot of another grade than ${grade.name}`)
  return { mould, item, caster, grade, lot }
}

type Named = Awaited<ReturnType<typeof loadNamed>>

/** Refusals that are not about the request's shape: 409 naming what stands in the way. */
function refuse(named: Named, isSample: boolean) {
  const { mould, item } = named
  if (mould.state === 'repair' || mould.state === 'retired') {
    conflict(`Mould ${mould.code} is in ${mould.state === 'repair' ? 'repair' : 'retirement'} and cannot be planned`)
  }
  if (item && item.sample_required && item.sample_state !== 'approved' && !isSample) {
    conflict(`Job ${item.job_code} is waiting for sample approval: plan its sample first`)
  }
}

/** The clashing pour on a mould as a 409: 'This mould is already taken from … to … by the J-2601 pour on CR-101 mixing at …'. */
async function refuseClash(db: Knex, ws: WorkshopRow, mouldId: number, start: Date, end: Date, selfId?: number) {
  const c = await poursRepo.clash(db, ws.id, mouldId, start, end, selfId)
  if (!c) return
  // the other pour by what the lead sees on the board: its job, its mould and its mix time
  conflict(`This mould is already taken from ${boardClock(c.slot_start, ws.timezone, ws.locale)} to ${boardClock(c.slot_end, ws.timezone, ws.locale)}`
    + ` by the ${c.job_code ? `${c.job_code} ` : ''}pour on ${c.mould_code} mixing at ${boardClock(c.mix_at, ws.timezone, ws.locale)}`, { pourId: c.id })
}

/** The pour's timing and batch from the model, on the workshop's shop temperature of its day. */
async function timingAndBatch(trx: Knex, ws: WorkshopRow, named: Named, p: PourPlanInput) {
  const { mould, item, grade } = named
  const gradeModel = plasterGradeFromRow(grade)
  const consistency = p.consistency ?? (item?.consistency ? Number(item.consistency) : gradeModel.consistency.default)
  // a lead's applied calibration is the grade's starting set factor; the board may scale it per pour
  const setFactor = p.setFactor ?? appliedSetFactor(gradeCalibrationFromRow(grade))
  const day = boardLocalDay(p.slotStart, ws.timezone)
  const slurryTempC = (await shopDaysRepo.tempOn(trx, ws.id, day)) ?? Number(ws.default_shop_temp_c)
  const t = pourTimingFromSlotStart({
    slotStart: p.slotStart, grade: gradeModel, consistency, slurryTempC, setFactor,
    mould: { prepMinutes: mould.prep_minutes, cleanMinutes: mould.clean_minutes, maxDwellMinutes: mould.max_dwell_minutes },
  })
  // one pour fills every cavity, with the shell (fibrous) or the cavity (solid) of each
  const batch = batchForCavity({ cavityLitres: pourLitres(mouldCastFromRow(mould)), consistency, grade: gradeModel, wastePct: POUR_WASTE_PCT })
  return { t, batch, consistency, setFactor }
}

/** The row to write with the board's warnings; `extraWarning` is a retimed pour's clipped slot. */
async function pourWrite(trx: Knex, ws: WorkshopRow, named: Named, p: PourPlanInput, plan: Awaited<ReturnType<typeof timingAndBatch>>, selfId: number | undefined, extraWarning: string | null = null): Promise<PourWrite> {
  const { mould, item, caster, grade, lot } = named
  const { t, batch, consistency, setFactor } = plan
  const near = caster ? await poursRepo.casterMixesNear(trx, ws.id, caster.id, t.mixAt, selfId) : []
  const lotLeft = lot ? Number(lot.bags_received) * Number(lot.bag_kg) - (await poursRepo.lotUsedKg(trx, ws.id, lot.id, selfId)) - batch.plasterKg : 0
  const warnings = pourWarnings({
    modelWarnings: t.warnings,
    dwell: pourDwellWarning(workshopCalendar(ws), t),
    shiftBreak: pourBreakWarning(workshopCalendar(ws), t.mixAt, ws.timezone),
    casterClashes: near.filter(n => mixesOverlap(n.mix_at, t.mixAt)).map(n => ({ mouldCode: n.mould_code, mixAt: n.mix_at })),
    casterName: caster?.name,
    mould: { code: mould.code, pulls: mould.pulls, expectedPulls: mould.expected_pulls },
    mouldPlannedPours: (await poursRepo.openOnMould(trx, ws.id, mould.id, selfId)) + 1,
    lot: lot ? { code: lot.lot_code, leftKg: lotLeft } : null,
  }, ws.timezone)
  if (extraWarning) warnings.push(extraWarning)
  return {
    job_item_id: item?.id ?? null, mould_id: mould.id, caster_id: caster?.id ?? null, grade_id: grade.id, lot_id: lot?.id ?? null,
    is_sample: p.isSample ?? false, consistency, set_factor: setFactor, slotStart: t.slotStart, slotEnd: t.slotEnd, mix_at: t.mixAt,
    demould_open_at: t.demouldOpenAt, demould_close_at: t.demouldCloseAt,
    plaster_kg_planned: batch.plasterKg, water_kg_planned: batch.waterKg, warnings,
  }
}

/**
 * The row to write for a pour the lead plans or moves, and its warnings: every rule of the
 * board in one place. The mould is locked first; a mould in repair or retired, a job waiting
 * for its sample and a clash with another pour on the mould are refused (409).
 * `selfId` is the pour being moved, left out of its own clash, caster, life and lot counts.
 */
export async function planPourRow(trx: Knex, ws: WorkshopRow, p: PourPlanInput, selfId?: number): Promise<PourWrite> {
  await poursRepo.lockMoulds(trx, ws.id, [p.mouldId])
  const named = await loadNamed(trx, ws.id, p)
  refuse(named, p.isSample ?? false)
  const plan = await timingAndBatch(trx, ws, named, p)
  await refuseClash(trx, ws, named.mould.id, plan.t.slotStart, plan.t.slotEnd, selfId)
  return pourWrite(trx, ws, named, p, plan, selfId)
}

/**
 * The row of a planned pour re-timed in place (its shop day changed): nothing is refused, the
 * pour already stands on the board; the slot is clipped at the next pour instead (clipToNext).
 */
export async function retimePourRow(trx: Knex, ws: WorkshopRow, p: PourPlanInput, selfId: number): Promise<PourWrite> {
  const named = await loadNamed(trx, ws.id, p)
  const plan = await timingAndBatch(trx, ws, named, p)
  const clipped = await clipToNext(trx, ws, named.mould.id, plan.t, selfId)
  return pourWrite(trx, ws, named, p, plan, selfId, clipped)
}

/**
 * A recomputed pour (its shop day changed) keeps its slotStart; when its longer set would
 * now run into the next pour on the mould, the slot ends where that pour starts (the
 * exclusion constraint allows no overlap) and the pour carries a warning: the lead decides
 * which one moves, the shop-day entry does not fail.
 */
async function clipToNext(trx: Knex, ws: WorkshopRow, mouldId: number, t: { slotStart: Date; slotEnd: Date; demouldOpenAt: Date }, selfId: number) {
  const next = await poursRepo.nextStart(trx, ws.id, mouldId, t.slotStart, selfId)
  if (!next || next.getTime() >= t.slotEnd.getTime()) return null
  t.slotEnd = next
  return `With the day's shop temperature this cast is ready at ${boardClock(t.demouldOpenAt, ws.timezone, ws.locale)}, `
    + `after the next pour on this mould starts at ${boardClock(next, ws.timezone, ws.locale)}: move one of them.`
}

/**
 * Runs a write; when the exclusion constraint refuses it (a concurrent request booked the
 * mould between our check and our insert), answers 409 naming the pour that won.
 */
export async function withOverlapAnswer<T>(ws: WorkshopRow, mould: () => { id: number; start: Date; end: Date } | null, fn: () => Promise<T>): Promise<T> {
  try {
    return await fn()
  }
  catch (e) {
    const m = mould()
    // 23P01: the exclusion constraint refused; 40P01: a deadlock while checking it (moulds are
    // locked first, so this should not happen, but the answer is the same)
    const code = (e as { code?: string })?.code
    if ((code === '23P01' || code === '40P01') && m) await refuseClash(useDb(), ws, m.id, m.start, m.end)
    rethrowDbError(e, { pours_no_overlap: 'This mould is already taken at that time' })
  }
}

function eventData(w: PourWrite) {
  return { mouldId: w.mould_id, jobItemId: w.job_item_id, casterId: w.caster_id, slotStart: w.slotStart, mixAt: w.mix_at, warnings: w.warnings }
}

export async function createPour(actor: Actor, input: PourPlanInput): Promise<PourDto> {
  const db = useDb()
  const ws = await loadWorkshop(db, actor.workshopId)
  let write: PourWrite | undefined
  const id = await withOverlapAnswer(ws, () => write ? { id: write.mould_id, start: write.slotStart, end: write.slotEnd } : null, () =>
    db.transaction(async (trx) => {
      write = await planPourRow(trx, ws, input)
      const pourId = await poursRepo.insert(trx, ws.id, actor.id, write)
      await poursRepo.event(trx, { workshopId: ws.id, pourId, type: 'pour.planned', actorId: actor.id, data: eventData(write) })
      return pourId
    }))
  const dto = pourDto((await poursRepo.dto(db, ws.id, id))!)
  emitToWorkshop(ws.id, { type: 'pour.created', id, version: dto.version, row: dto })
  return dto
}

type Locked = NonNullable<Awaited<ReturnType<typeof poursRepo.forUpdate>>>

async function lockPlanned(trx: Knex, workshopId: number, id: number, version: number): Promise<Locked> {
  const row = await poursRepo.forUpdate(trx, workshopId, id)
  if (!row) notFound('Pour')
  if (row.version !== version) conflict('This pour was changed by someone else; reload to see it', { version: row.version })
  if (row.state !== 'planned') conflict(`Only planned pours can be changed; this one is ${row.state}`, { state: row.state })
  return row
}

export async function movePour(actor: Actor, id: number, input: PourMoveInput): Promise<PourDto> {
  const db = useDb()
  const ws = await loadWorkshop(db, actor.workshopId)
  let write: PourWrite | undefined
  await withOverlapAnswer(ws, () => write ? { id: write.mould_id, start: write.slotStart, end: write.slotEnd } : null, () =>
    db.transaction(async (trx) => {
      const row = await lockPlanned(trx, ws.id, id, input.version)
      write = await planPourRow(trx, ws, {
        mouldId: input.mouldId ?? row.mould_id,
        slotStart: input.slotStart ?? row.slot_start,
        jobItemId: row.job_item_id,
        casterId: input.casterId === undefined ? row.caster_id : input.casterId,
        gradeId: row.grade_id,
        consistency: input.consistency ?? Number(row.consistency),
        setFactor: input.setFactor ?? Number(row.set_factor),
        lotId: input.lotId === undefined ? row.lot_id : input.lotId,
        isSample: row.is_sample,
      }, id)
      if (!(await poursRepo.replan(trx, ws.id, id, input.version, write))) conflict('This pour was changed by someone else; reload to see it')
      await poursRepo.event(trx, { workshopId: ws.id, pourId: id, type: 'pour.moved', actorId: actor.id, data: { from: { mouldId: row.mould_id, slotStart: row.slot_start }, ...eventData(write) } })
    }))
  const dto = pourDto((await poursRepo.dto(db, ws.id, id))!)
  emitToWorkshop(ws.id, { type: 'pour.updated', id, version: dto.version, row: dto })
  return dto
}

export async function voidPour(actor: Actor, id: number, input: { version: number; reason: string }): Promise<PourDto> {
  const db = useDb()
  await db.transaction(async (trx) => {
    await lockPlanned(trx, actor.workshopId, id, input.version)
    if (!(await poursRepo.voidPour(trx, actor.workshopId, id, input.version, input.reason))) conflict('This pour was changed by someone else; reload to see it')
    await poursRepo.event(trx, { workshopId: actor.workshopId, pourId: id, type: 'pour.voided', actorId: actor.id, data: { reason: input.reason } })
  })
  const dto = pourDto((await poursRepo.dto(db, actor.workshopId, id))!)
  emitToWorkshop(actor.workshopId, { type: 'pour.voided', id, version: dto.version, row: dto })
  return dto
}
