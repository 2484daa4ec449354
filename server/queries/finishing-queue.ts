// The finisher's queue screen's read (GET /api/finishing) and the piece card every finishing answer carries.
import { dryingThicknessMm, mouldCastFromRow } from '#shared/utils/plaster-fibrous'
import type { Knex } from 'knex'
import type { Actor } from '../utils/auth'
import type { FinishingPieceDto, FinishingQueue } from '#shared/types/finishing'
import { piecesRepo, type PieceViewRow } from '../repos/pieces'
import { shopDaysRepo } from '../repos/shop-days'
import type { WorkshopRow } from '../repos/workshops'
import { dryness } from '#shared/utils/plaster-drying'
import { FINISHING_TEAM_LIFT_KG, finishingHandlingKg } from '#shared/utils/finishing'
import { boardLocalDay } from '#shared/utils/board-rules'
import { loadWorkshop } from '../services/workshop'

const num = (v: number | null) => (v === null ? null : Number(v))
const iso = (d: Date | null) => (d ? new Date(d).toISOString() : null)

export function pieceDto(r: PieceViewRow): FinishingPieceDto {
  const dryMassKg = Number(r.dry_mass_kg)
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
    lastWeighing: d && r.weighed_at ? { kg: lastKg!, at: iso(r.weighed_at)!, freeWaterKg: d.freeWaterKg, freeWaterPct: d.freeWaterPct, isDry: d.isDry } : null,
    dispatchId: r.dispatch_id === null ? null : Number(r.dispatch_id),
  }
}

export async function pieceDtos(db: Knex, workshopId: number, ids: number[]) {
  return (await piecesRepo.view(db, workshopId, ids)).map(pieceDto)
}

/** The drying room's conditions to start from: today's shop day when the lead entered one, else the workshop's usual. */
export async function dryingRoom(db: Knex, ws: WorkshopRow, at: Date): Promise<FinishingQueue['room']> {
  const day = await shopDaysRepo.on(db, ws.id, boardLocalDay(at, ws.timezone))
  return day
    ? { tempC: Number(day.temp_c), humidityPct: Number(day.humidity_pct), source: 'shop day' }
    : { tempC: Number(ws.default_shop_temp_c), humidityPct: Number(ws.default_humidity_pct), source: 'workshop' }
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
  const [rows, room] = await Promise.all([piecesRepo.open(db, ws.id), dryingRoom(db, ws, new Date())])
  const pieces = rows.map(pieceDto)
  const inState = (s: FinishingPieceDto['state']) => pieces.filter(p => p.state === s)
  return {
    timezone: ws.timezone,
    room,
    toFettle: inState('to_fettle'),
    repair: inState('repair'),
    drying: inState('drying').sort(byDryBy),
    ready: inState('ready').sort(byJobThenMark),
    packed: inState('packed').sort(byJobThenMark),
  }
}
