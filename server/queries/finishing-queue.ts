// The finisher's queue screen's read (GET /api/finishing) and the piece card every finishing answer carries.
import { dryingThicknessMm, mouldCastFromRow } from '#shared/utils/plaster-fibrous'
import type { Knex } from 'knex'
import type { Actor } from '../utils/auth'
import type { FinishingDryingRoom, FinishingPieceDto, FinishingQueue } from '#shared/types/finishing'
import { piecesRepo, type PieceViewRow } from '../repos/pieces'
import { shopDaysRepo } from '../repos/shop-days'
import type { WorkshopRow } from '../repos/workshops'
import { constantWeight, dryMassGuide, dryness } from '#shared/utils/plaster-drying'
import { FINISHING_FALLING_RATE_SPELLS, FINISHING_TEAM_LIFT_KG, finishingFallingRate, finishingHandlingKg } from '#shared/utils/finishing'
import { boardLocalDay } from '#shared/utils/board-rules'
import { loadWorkshop } from '../services/workshop'

const num = (v: number | null) => (v === null ? null : Number(v))
const iso = (d: Date | null) => (d ? new Date(d).toISOString() : null)

/** The batch gauged over the planned one, % (0 when not known): the dry mass guide's low end. */
function batchExcessPct(r: PieceViewRow) {
  const planned = Number(r.plaster_kg_planned)
  const actual = Number(r.plaster_kg_actual)
  return planned > 0 && actual > 0 ? Math.max(0, (actual / planned - 1) * 100) : 0
}

export function pieceDto(r: PieceViewRow): FinishingPieceDto {
  const dryMassKg = Number(r.dry_mass_kg)
  const weighings = (r.spell_weighings ?? []).map(w => ({ kg: Number(w.kg), at: new Date(w.at).toISOString() }))
  const guide = dryMassGuide(dryMassKg, batchExcessPct(r))
  const wetMassKg = Number(r.wet_mass_kg)
  const lastKg = num(r.weighed_kg)
  const d = lastKg === null ? null : dryness({ weighedKg: lastKg, dryMassKg })
  const handlingKg = finishingHandlingKg({ state: r.state, wetMassKg, dryMassKg, lastWeighedKg: lastKg })
  return {
    id: Number(r.id),
    version: r.version,
    mark: r.mark,
    state: r.state,
    job: r.job_id ? { id: Number(r.job_id), code: r.job_code!, title: r.job_title!, dueOn: r.job_due_on } : null,
    item: r.item_id ? { id: Number(r.item_id), description: r.item_description! } : null,
    mould: { code: r.mould_code, casts: r.mould_casts, cavityLitres: Number(r.cavity_litres), thicknessMm: dryingThicknessMm(mouldCastFromRow(r)) },
    dryMassKg,
    wetMassKg,
    handlingKg,
    teamLift: handlingKg > FINISHING_TEAM_LIFT_KG,
    demouldedAt: iso(r.demoulded_at),
    dryBy: iso(r.dry_by),
    dryingTempC: num(r.drying_temp_c),
    dryingHumidityPct: num(r.drying_humidity_pct),
    reason: r.reason,
    lastWeighing: d && r.weighed_at ? { kg: lastKg!, at: iso(r.weighed_at)!, freeWaterKg: d.freeWaterKg, freeWaterPct: d.freeWaterPct } : null,
    weighings,
    constantWeight: constantWeight(weighings.map(w => ({ kg: w.kg, at: new Date(w.at) }))),
    dryMassGuide: { lowKg: guide.lowKg, highKg: guide.highKg, batchExcessPct: guide.batchExcessPct },
    dispatchId: r.dispatch_id === null ? null : Number(r.dispatch_id),
    timer: (r.timer_type === 'piece.fettle_start' || r.timer_type === 'piece.repair_start') && r.timer_at
      ? { work: r.timer_type === 'piece.fettle_start' ? 'fettle' : 'repair', since: iso(r.timer_at)!, by: r.timer_by_name }
      : null,
  }
}

export async function pieceDtos(db: Knex, workshopId: number, ids: number[]) {
  return (await piecesRepo.view(db, workshopId, ids)).map(pieceDto)
}

/** The drying room's conditions to start from: today's shop day when the lead entered one, else the workshop's usual. */
export async function dryingRoom(db: Knex, ws: WorkshopRow, at: Date): Promise<FinishingDryingRoom> {
  const day = await shopDaysRepo.on(db, ws.id, boardLocalDay(at, ws.timezone))
  return day
    ? { tempC: Number(day.temp_c), humidityPct: Number(day.humidity_pct), source: 'shop day' }
    : { tempC: Number(ws.default_shop_temp_c), humidityPct: Number(ws.default_humidity_pct), source: 'workshop' }
}

/** The shop's falling-rate factor from its latest drying spells (finishingFallingRate). */
export async function shopFallingRate(db: Knex, workshopId: number) {
  const spells = await piecesRepo.dryingSpells(db, workshopId, FINISHING_FALLING_RATE_SPELLS)
  const num = (v: string | null) => (v === null ? null : Number(v))
  return finishingFallingRate(spells.map(s => ({
    fettledAt: new Date(s.fettled_at),
    // spells put to dry before the factor was stored used factor 1, so their hours are the base
    estimatedHours: num(s.base_hours) ?? num(s.hours),
    weighings: s.weighings.map(w => ({ kg: Number(w.kg), at: new Date(w.at) })),
  })))
}

const byDryBy = (a: FinishingPieceDto, b: FinishingPieceDto) =>
  (a.dryBy ?? '9999').localeCompare(b.dryBy ?? '9999') || a.id - b.id
const byJobThenMark = (a: FinishingPieceDto, b: FinishingPieceDto) =>
  (a.job?.code ?? '~').localeCompare(b.job?.code ?? '~') || a.mark.localeCompare(b.mark)

/**
 * Every piece still in the finisher's hands. To fettle and in repair: most urgent job first
 * (due date), then the oldest cast (the repo's order); drying: the soonest dry-by first;
 * ready and packed: by job, then mark, as they are loaded.
 */
export async function finishingQueue(actor: Actor): Promise<FinishingQueue> {
  const db = useDb()
  const ws = await loadWorkshop(db, actor.workshopId)
  const [rows, room, fallingRate] = await Promise.all([piecesRepo.open(db, ws.id), dryingRoom(db, ws, new Date()), shopFallingRate(db, ws.id)])
  const pieces = rows.map(pieceDto)
  const inState = (s: FinishingPieceDto['state']) => pieces.filter(p => p.state === s)
  return {
    timezone: ws.timezone,
    room: { ...room, fallingRate },
    toFettle: inState('to_fettle'),
    repair: inState('repair'),
    drying: inState('drying').sort(byDryBy),
    ready: inState('ready').sort(byJobThenMark),
    packed: inState('packed').sort(byJobThenMark),
  }
}
