// Fill the board from open job items: the planner's input read from the database (preview),
// and the lead's accepted proposal written in one transaction (accept).
import type { Knex } from 'knex'
import { H3Error } from 'h3'
import type { Actor } from '../utils/auth'
import type { WorkshopRow } from '../repos/workshops'
import { planningRepo } from '../repos/planning'
import { poursRepo } from '../repos/pours'
import { planPourRow, withOverlapAnswer } from './pours'
import { loadWorkshop, workshopCalendar } from './workshop'
import { plannerCalendars } from './calendars'
import { boardDayStart } from '#shared/utils/board-rules'
import { planPours } from '#shared/utils/planner'
import { FETTLING_ALLOWANCE_HOURS, plannedCastReadyHours } from '#shared/utils/client-completion'
import { dryingThicknessMm, mouldCastFromRow } from '#shared/utils/plaster-fibrous'
import { mouldWorksRepo } from '../repos/mould-works'
import { shopFallingRate } from '../queries/finishing-queue'
import { gradeCalibrationFromRow } from '#shared/utils/catalogue'
import { appliedSetFactor, calibrationNote } from '#shared/utils/plaster-set'
import type { PlanPoursInput, PlannerItem } from '#shared/types/planner'

const DAY_MS = 86_400_000
const nextDay = (day: string) => new Date(Date.parse(`${day}T00:00:00Z`) + DAY_MS).toISOString().slice(0, 10)

async function plannerInput(db: Knex, ws: WorkshopRow, from: string, to: string) {
  const start = boardDayStart(from, ws.timezone)
  const end = boardDayStart(nextDay(to), ws.timezone)
  const [moulds, rows, grades, pours, days, casters, calendars, benchLimits, works, fallingRate] = await Promise.all([
    planningRepo.moulds(db, ws.id), planningRepo.openItems(db, ws.id), planningRepo.grades(db, ws.id),
    planningRepo.pours(db, ws.id, start), planningRepo.shopDays(db, ws.id, from), planningRepo.casters(db, ws.id),
    plannerCalendars(db, ws.id, from), planningRepo.benchLimits(db, ws.id), mouldWorksRepo.openAvailability(db, ws.id),
    shopFallingRate(db, ws.id),
  ])
  // open mould work: the mould takes no pour before the start of its available-from day
  const availableFrom = new Map(works.map(w => [Number(w.mould_id), boardDayStart(w.available_from, ws.timezone)]))
  // the drying room at the workshop's usual conditions and the shop's falling-rate factor, as the client's date takes them
  const room = { tempC: Number(ws.default_shop_temp_c), humidityPct: Number(ws.default_humidity_pct), fallingRateFactor: fallingRate.factor }
  const mouldById = new Map(moulds.map(m => [Number(m.id), m]))
  const profileMould = new Map<number, (typeof moulds)[number]>()
  for (const m of moulds) if (m.profile_id && !profileMould.has(Number(m.profile_id))) profileMould.set(Number(m.profile_id), m)
  const gradeById = new Map(grades.map(g => [g.id, g]))
  const descriptions = new Map<string, string>()
  // each grade the plan times pours with, and where its set time comes from
  const setTimes = new Map<number, { grade: string; note: string; calibrated: boolean }>()
  const items: PlannerItem[] = []
  for (const r of rows) {
    const grade = gradeById.get(r.grade_id) ?? grades.find(g => !g.archived_at)
    const remaining = r.pieces_needed - r.pieces_counted
    if (!grade || remaining <= 0) continue
    const model = plasterGradeFromRow(grade)
    descriptions.set(String(r.id), r.description)
    const calibration = gradeCalibrationFromRow(grade)
    setTimes.set(grade.id, { grade: grade.name, note: calibrationNote(calibration), calibrated: calibration.applied })
    const consistency = r.consistency ? Number(r.consistency) : model.consistency.default
    // the profile's moulds are identical, so the item's own mould or any of its profile gives the cavity
    const castIn = (r.mould_id && mouldById.get(Number(r.mould_id))) || (r.profile_id && profileMould.get(Number(r.profile_id))) || null
    items.push({
      itemId: String(r.id), jobId: String(r.job_id), jobCode: r.job_code, dueOn: r.due_on,
      sampleReleased: !r.sample_required || r.sample_state === 'approved', depositReleased: r.deposit_released, piecesRemaining: remaining,
      mouldIds: r.mould_id ? [String(r.mould_id)] : [], profileId: r.profile_id ? String(r.profile_id) : null, grade: model,
      consistency,
      // one piece's cavity or fibrous shell, drying through its own section
      readyHours: castIn ? plannedCastReadyHours({ cavityLitres: Number(castIn.cavity_litres), consistency, grade: model, room, thicknessMm: dryingThicknessMm(mouldCastFromRow(castIn)) }) : 0,
      // its fettling is people's work, counted in the shop's shift time
      fettleShiftHours: castIn ? FETTLING_ALLOWANCE_HOURS : 0,
      // the grade's applied calibration (1 until a lead applies one)
      setFactor: appliedSetFactor(gradeCalibrationFromRow(grade)),
    })
  }
  const input: PlanPoursInput = {
    calendar: workshopCalendar(ws), from: start, to: end, items, closures: calendars.closures,
    moulds: moulds.map(m => ({
      id: String(m.id), code: m.code, benchId: m.bench_id ? String(m.bench_id) : null, state: m.state, prepMinutes: m.prep_minutes,
      cleanMinutes: m.clean_minutes, maxDwellMinutes: m.max_dwell_minutes, pulls: m.pulls, expectedPulls: m.expected_pulls,
      profileId: m.profile_id ? String(m.profile_id) : null, availableFrom: availableFrom.get(Number(m.id)) ?? null, cavities: Number(m.cavities),
    })),
    existingPours: pours.map(p => ({ mouldId: String(p.mould_id), slotStart: p.slot_start, slotEnd: p.slot_end, casterId: p.caster_id ? String(p.caster_id) : null, mixAt: p.mix_at })),
    shopTempByDay: Object.fromEntries(days.map(d => [d.day, Number(d.temp_c)])),
    defaultShopTempC: Number(ws.default_shop_temp_c),
    // Never propose a pour in the past: the plan starts now when the range already began.
    options: {
      startAt: new Date(Math.max(Date.now(), start.getTime())), casters: casters.map(c => String(c.id)),
      casterCalendars: calendars.casterCalendars,
      benchMaxMixes: Object.fromEntries(benchLimits.map(b => [String(b.id), b.max_mixes])),
    },
  }
  return { input, descriptions, setTimes: [...setTimes.values()] }
}

export async function previewPlan(actor: Actor, range: { from: string; to: string }) {
  const db = useDb()
  const ws = await loadWorkshop(db, actor.workshopId)
  const { input, descriptions, setTimes } = await plannerInput(db, ws, range.from, range.to)
  const result = planPours(input)
  return {
    pours: result.pours.map(p => ({
      jobItemId: Number(p.itemId), jobId: Number(p.jobId), jobCode: p.jobCode, itemDescription: descriptions.get(p.itemId) ?? null,
      mouldId: Number(p.mouldId), mouldCode: p.mouldCode, benchId: p.benchId ? Number(p.benchId) : null,
      casterId: p.casterId ? Number(p.casterId) : null, day: p.day, slotStart: p.slotStart.toISOString(), mixAt: p.mixAt.toISOString(),
      demouldOpenAt: p.demouldOpenAt.toISOString(), demouldCloseAt: p.demouldCloseAt.toISOString(), slotEnd: p.slotEnd.toISOString(),
      slurryTempC: p.slurryTempC, consistency: p.consistency, setFactor: p.setFactor, overnight: p.overnight, warnings: p.warnings,
    })),
    jobs: result.jobs.map(j => ({ ...j, jobId: Number(j.jobId), readyAt: j.readyAt ? j.readyAt.toISOString() : null })),
    unplaced: result.unplaced.map(u => ({ ...u, itemId: Number(u.itemId), jobId: Number(u.jobId) })),
    moulds: result.moulds.map(m => ({ ...m, mouldId: Number(m.mouldId) })),
    setTimes,
  }
}

/** Adds `pourIndex` (the proposal refused) to a 4xx answer's data; other errors pass as they are. */
async function withPourIndex<T>(index: () => number | null, fn: () => Promise<T>): Promise<T> {
  try {
    return await fn()
  }
  catch (e) {
    const err = asHttpError(e)
    const i = index()
    if (i !== null && err instanceof H3Error && err.statusCode >= 400 && err.statusCode < 500) {
      err.data = { ...(err.data as Record<string, unknown> | undefined), pourIndex: i }
    }
    throw err
  }
}

export interface AcceptedPour { jobItemId: number; mouldId: number; slotStart: Date; casterId?: number | null }

/** Writes the accepted pours, all or none: any refusal (an overlap above all) rolls back every one. */
export async function acceptPlan(actor: Actor, range: { from: string; to: string }, pours: AcceptedPour[]) {
  const db = useDb()
  const ws = await loadWorkshop(db, actor.workshopId)
  const start = boardDayStart(range.from, ws.timezone).getTime()
  const end = boardDayStart(nextDay(range.to), ws.timezone).getTime()
  pours.forEach((p, i) => {
    const t = p.slotStart.getTime()
    if (t < start || t >= end) unprocessable([{ field: `pours.${i}.slotStart`, message: `must fall between ${range.from} and ${range.to}` }])
  })
  let last: { id: number; start: Date; end: Date } | null = null
  // the proposal being written when a refusal comes: the board names it (job, mould, time)
  let current: number | null = null
  const created = await withPourIndex(() => current, () => withOverlapAnswer(ws, () => last, () => db.transaction(async (trx) => {
    // every mould of the plan locked up front, in id order, so two accepts cannot deadlock
    await poursRepo.lockMoulds(trx, ws.id, pours.map(p => p.mouldId))
    for (const [i, p] of pours.entries()) {
      current = i
      last = null
      const write = await planPourRow(trx, ws, { jobItemId: p.jobItemId, mouldId: p.mouldId, slotStart: p.slotStart, casterId: p.casterId ?? null })
      last = { id: write.mould_id, start: write.slotStart, end: write.slotEnd }
      const pourId = await poursRepo.insert(trx, ws.id, actor.id, write)
      await poursRepo.event(trx, { workshopId: ws.id, pourId, type: 'pour.planned', actorId: actor.id, data: { planner: true, mouldId: write.mould_id, jobItemId: write.job_item_id, slotStart: write.slotStart, warnings: write.warnings } })
    }
    return pours.length
  })))
  emitToWorkshop(ws.id, { type: 'board.refreshed', id: ws.id })
  return { created }
}
