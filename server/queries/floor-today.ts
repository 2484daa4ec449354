// The floor screen's read: today's pours (the workshop's local day) as cards with what a
// caster needs at the bench: mould, batch weights, the demould window, lots in stock, cautions.
import type { Knex } from 'knex'
import type { Actor } from '../utils/auth'
import { poursRepo, daySheetRepo, type PourDtoRow, type PourStepRow } from '../repos/pours'
import { BURN_CAUTION } from '#shared/utils/plaster'
import { boardLocalDay } from '#shared/utils/board-rules'
import type { FloorCardDto, FloorCaution } from '#shared/types/floor'
import type { CastType } from '#shared/utils/plaster-fibrous'
import { markRange } from '#shared/utils/piece-marks'
import type { PourDto } from '#shared/types/board'
import { pourDto } from '../services/pours'
import { loadWorkshop } from '../services/workshop'
import { cachedRead } from '../utils/read-cache'

export type { FloorCardDto }

type PourActuals = Pick<PourStepRow, 'id' | 'mixing_at' | 'poured_at' | 'demoulded_at' | 'plaster_kg_actual' | 'water_kg_actual'
  | 'water_temp_c' | 'powder_temp_c' | 'shop_temp_c' | 'slurry_temp_c'>
export interface FloorActualsRow extends PourActuals {
  backdated: boolean
  result: 'sound' | 'defect' | null
  defect: string | null
  lot_code: string | null
  piece_marks: string[]
  piece_id: number | null
  cavity_litres: number
  mould_state: string
  cavities: number
  cast_type: CastType
}

/** The floor's extra facts about pours: actuals, lot, piece, the mould's cavity and state; and the casts left overnight. */
const floorFacts = {
  /** Pours still mixing or setting whose prep started before the local day (a cast left overnight). */
  async openBefore(db: Knex, workshopId: number, day: string): Promise<number[]> {
    const r = await db.raw(`SELECT p.id FROM pours p JOIN workshops w ON w.id = p.workshop_id
      WHERE p.workshop_id = ? AND p.state IN ('mixing', 'setting') AND lower(p.slot) < (?::date)::timestamp AT TIME ZONE w.timezone
      ORDER BY lower(p.slot), p.id`, [workshopId, day])
    return r.rows.map((x: { id: string }) => Number(x.id))
  },
  /** The floor's extra facts for the given pours: actuals, lot, piece, the mould's cavity and state. */
  actuals(db: Knex, workshopId: number, ids: number[]): Promise<FloorActualsRow[]> {
    return db('pours as p').join('moulds as m', 'm.id', 'p.mould_id').leftJoin('plaster_lots as l', 'l.id', 'p.lot_id')
      // the first piece (cavity 1) for photos; every piece's mark, in cavity order, for the label
      .leftJoin('pieces as pc', function () {
        this.on('pc.pour_id', 'p.id').andOn('pc.workshop_id', 'p.workshop_id').andOnVal('pc.cavity', 1)
      })
      .select('p.id', 'p.mixing_at', 'p.poured_at', 'p.demoulded_at', 'p.backdated', 'p.plaster_kg_actual', 'p.water_kg_actual',
        'p.water_temp_c', 'p.powder_temp_c', 'p.shop_temp_c', 'p.slurry_temp_c', 'p.result', 'p.defect', 'l.lot_code',
        'pc.id as piece_id', 'm.cavity_litres', 'm.state as mould_state', 'm.cavities', 'm.cast_type')
      .select(db.raw(`(SELECT coalesce(array_agg(x.mark ORDER BY x.cavity), '{}') FROM pieces x
        WHERE x.pour_id = p.id AND x.workshop_id = p.workshop_id) AS piece_marks`))
      .where({ 'p.workshop_id': workshopId }).whereIn('p.id', ids)
  },
}

const num = (v: string | number | null) => (v === null ? null : Number(v))
const iso = (d: Date | null) => (d ? d.toISOString() : null)

function actualOf(a: FloorActualsRow): FloorCardDto['actual'] {
  return {
    mixingAt: iso(a.mixing_at), pouredAt: iso(a.poured_at), demouldedAt: iso(a.demoulded_at), backdated: a.backdated,
    plasterKg: num(a.plaster_kg_actual), waterKg: num(a.water_kg_actual), waterTempC: num(a.water_temp_c), powderTempC: num(a.powder_temp_c),
    shopTempC: num(a.shop_temp_c), slurryTempC: num(a.slurry_temp_c), result: a.result, defect: a.defect, lotCode: a.lot_code,
    pieceMark: a.piece_marks.length ? markRange(a.piece_marks) : null, pieceMarks: a.piece_marks,
    pieceId: a.piece_id === null ? null : Number(a.piece_id),
  }
}

/** Heat when the gauge is big enough to burn (BURN_CAUTION); dust whenever powder is still to be mixed. */
function cautionsOf(p: PourDto): FloorCaution[] {
  const out: FloorCaution[] = []
  if (p.state === 'planned' || p.state === 'mixing') out.push('dust')
  if (p.state !== 'demoulded' && p.plasterKg + p.waterKg >= BURN_CAUTION.slurryKg) out.push('heat')
  return out
}

/**
 * The lots a caster is offered for a pour: those with stock (and the pour's own), in-date ones
 * first, oldest received first (first in, first out, as the day sheet's lotToOpen), then the
 * expired ones, marked (old plaster sets fast or unevenly: common practice).
 */
function floorLots(lots: { id: number | string; lot_code: string; bags_received: number | string; bag_kg: number | string; used_kg: number | string; use_by_day: string | null; received_day: string }[], ownLotId: number, today: string): FloorCardDto['lots'] {
  return lots
    .map(l => ({
      id: Number(l.id), lotCode: l.lot_code, leftKg: Number(l.bags_received) * Number(l.bag_kg) - Number(l.used_kg),
      useBy: l.use_by_day, expired: l.use_by_day !== null && l.use_by_day < today, receivedOn: l.received_day,
    }))
    .filter(l => l.leftKg > 0 || ownLotId === l.id)
    .sort((a, b) => Number(a.expired) - Number(b.expired) || a.receivedOn.localeCompare(b.receivedOn) || a.id - b.id)
    .map(({ receivedOn: _, ...l }) => l)
}

/** Cards for the given pours, in the order given. */
export async function floorCards(db: Knex, workshopId: number, ids: number[]): Promise<FloorCardDto[]> {
  if (!ids.length) return []
  // one query for every card (a query per pour held one pooled connection each under load)
  const byId = new Map((await poursRepo.dtos(db, workshopId, ids)).map(r => [Number(r.id), r]))
  return cardsOf(db, workshopId, ids.map(id => byId.get(id)).filter(r => !!r))
}

/** Cards for pours already read as DTO rows: their actuals and the lots of their grades, read side by side. */
async function cardsOf(db: Knex, workshopId: number, rows: PourDtoRow[]): Promise<FloorCardDto[]> {
  if (!rows.length) return []
  const gradeIds = [...new Set(rows.map(r => Number(r.grade_id)))]
  const [facts, lots] = await Promise.all([
    floorFacts.actuals(db, workshopId, rows.map(r => Number(r.id))),
    daySheetRepo.lots(db, workshopId, gradeIds),
  ])
  const actuals = new Map(facts.map(a => [Number(a.id), a]))
  const today = boardLocalDay(new Date(), rows[0]!.timezone)
  return rows.map((r) => {
    const a = actuals.get(Number(r.id))!
    const pour = pourDto(r)
    return {
      pour,
      mould: { code: r.mould_code, casts: r.casts, cavityLitres: Number(a.cavity_litres), state: a.mould_state, cavities: Number(a.cavities), castType: a.cast_type },
      bench: r.bench_id ? { id: Number(r.bench_id), name: r.bench_name! } : null,
      actual: actualOf(a),
      lots: floorLots(lots.filter(l => Number(l.grade_id) === Number(r.grade_id)), Number(r.lot_id), today),
      cautions: cautionsOf(pour),
    }
  })
}

/**
 * Today's pours for the floor: a caster's own; a lead's all (or one caster's with casterId).
 * A pour whose prep starts today, plus any earlier pour still mixing or setting (a cast left
 * overnight must still be demoulded), in slot order.
 *
 * The busiest read of the app: every tablet reads it again on every live event of its
 * workshop. So the workshop's whole day is read once and shared for a moment
 * (server/utils/read-cache.ts, dropped on every change), and each person gets their own cards
 * out of it.
 */
export async function floorToday(actor: Actor, casterId?: number) {
  const day = await cachedRead(actor.workshopId, 'floor-today', () => workshopFloorToday(actor.workshopId))
  const who = actor.role === 'caster' ? actor.id : casterId
  return who === undefined ? day : { ...day, cards: day.cards.filter(c => c.pour.casterId === who) }
}

/**
 * Every card of the workshop's day: today's pours come as DTO rows at once and only the
 * overnight ones are read again, and the two lists are read side by side.
 */
async function workshopFloorToday(workshopId: number) {
  const db = useDb()
  const ws = await loadWorkshop(db, workshopId)
  const day = boardLocalDay(new Date(), ws.timezone)
  const [today, open] = await Promise.all([poursRepo.startingOn(db, ws.id, day), floorFacts.openBefore(db, ws.id, day)])
  const todayById = new Map(today.map(r => [Number(r.id), r]))
  const overnight = await poursRepo.dtos(db, ws.id, open.filter(id => !todayById.has(id)))
  const overnightById = new Map(overnight.map(r => [Number(r.id), r]))
  const ids = [...open, ...today.map(r => Number(r.id))].filter((id, i, all) => all.indexOf(id) === i)
  const rows = ids.map(id => todayById.get(id) ?? overnightById.get(id)).filter(r => !!r)
  return { day, timezone: ws.timezone, cards: await cardsOf(db, ws.id, rows) }
}
