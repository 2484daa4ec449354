// The piece page's read (GET /api/pieces/:id) and the label's facts: the piece card, its pour
// (grade, lot, consistency, caster, times), weighings, photos, its register entries, where a run
// piece goes and the dispatch note it left on. Another workshop's piece is a 404.
import type { Knex } from 'knex'
import type { Actor } from '../utils/auth'
import type { FinishingActionKind } from '#shared/utils/finishing-steps'
import type { PieceHistoryDto, PieceStoryDto } from '#shared/types/pieces'
import type { FinishingPieceDto } from '#shared/types/finishing'
import { FINISHING_ACTION_KINDS } from '#shared/utils/finishing-steps'
import { DEFAULT_MIN_PIECE_M } from '#shared/utils/job-schemas'
import { dryness } from '#shared/utils/plaster-drying'
import { pieceNextSteps, pieceRunCutList, pieceRunPlace, type PieceRunPlace } from '#shared/utils/piece-labels'
import { pieceDtos } from './finishing-queue'
import { pieceLabelsRepo } from '../repos/piece-labels'
import { loadWorkshop } from '../services/workshop'

const iso = (d: Date | null) => (d ? new Date(d).toISOString() : null)

/**
 * Where each run piece goes: the item's walls cut into cast lengths (runCutList), and the
 * piece's length number in cast order among the item's pieces that were not rejected.
 */
export async function piecePlaces(db: Knex, workshopId: number, ids: number[]): Promise<Map<number, PieceRunPlace>> {
  if (!ids.length) return new Map()
  const r = await db.raw(`SELECT c.id, i.walls, i.min_piece_m, i.spares_pct, m.cast_length_m,
      (SELECT count(*)::int FROM pieces x WHERE x.workshop_id = c.workshop_id AND x.job_item_id = c.job_item_id
        AND x.state <> 'rejected' AND x.id <= c.id) AS length_no
    FROM pieces c
    JOIN job_items i ON i.id = c.job_item_id AND i.workshop_id = c.workshop_id
    LEFT JOIN moulds m ON m.id = i.mould_id AND m.workshop_id = i.workshop_id
    WHERE c.workshop_id = ? AND c.id = ANY(?) AND i.walls IS NOT NULL AND c.state <> 'rejected'`, [workshopId, ids])
  const places = new Map<number, PieceRunPlace>()
  for (const row of r.rows) {
    const cutList = pieceRunCutList({
      walls: row.walls, castLengthM: row.cast_length_m === null ? null : Number(row.cast_length_m),
      minPieceM: row.min_piece_m === null ? DEFAULT_MIN_PIECE_M : Number(row.min_piece_m), sparesPct: Number(row.spares_pct),
    })
    if (cutList) places.set(Number(row.id), pieceRunPlace(cutList, row.length_no))
  }
  return places
}

async function pourOf(db: Knex, workshopId: number, pieceId: number): Promise<PieceStoryDto['pour']> {
  const p = await db('pieces as c')
    .join('pours as p', function () {
      this.on('p.id', 'c.pour_id').andOn('p.workshop_id', 'c.workshop_id')
    })
    .join('plaster_grades as g', function () {
      this.on('g.id', 'p.grade_id').andOn('g.workshop_id', 'p.workshop_id')
    })
    .leftJoin('plaster_lots as l', function () {
      this.on('l.id', 'p.lot_id').andOn('l.workshop_id', 'p.workshop_id')
    })
    .leftJoin('users as u', 'u.id', 'p.caster_id')
    .first('p.id', 'g.name as grade', 'l.lot_code', 'p.consistency', 'u.name as caster', 'p.is_sample', 'p.mix_at', 'p.mixing_at',
      'p.poured_at', 'p.demoulded_at', 'p.backdated', 'p.result', 'p.defect')
    .where({ 'c.workshop_id': workshopId, 'c.id': pieceId })
  return {
    id: Number(p.id), grade: p.grade, lot: p.lot_code, consistency: Number(p.consistency), caster: p.caster, isSample: p.is_sample,
    plannedMixAt: iso(p.mix_at)!, mixingAt: iso(p.mixing_at), pouredAt: iso(p.poured_at), demouldedAt: iso(p.demoulded_at),
    backdated: p.backdated, result: p.result, defect: p.defect,
  }
}

async function weighingsOf(db: Knex, workshopId: number, pieceId: number, dryMassKg: number): Promise<PieceStoryDto['weighings']> {
  const rows = await db('piece_weighings as w').leftJoin('users as u', 'u.id', 'w.weighed_by')
    .select('w.weighed_kg', 'w.weighed_at', 'u.name').where({ 'w.workshop_id': workshopId, 'w.piece_id': pieceId })
    .orderBy([{ column: 'w.weighed_at', order: 'asc' }, { column: 'w.id', order: 'asc' }])
  return rows.map((w) => {
    const d = dryness({ weighedKg: Number(w.weighed_kg), dryMassKg })
    return { kg: Number(w.weighed_kg), at: iso(w.weighed_at)!, by: w.name, freeWaterPct: d.freeWaterPct, isDry: d.isDry }
  })
}

const KINDS = new Set<string>(FINISHING_ACTION_KINDS)

async function historyOf(db: Knex, workshopId: number, pieceId: number): Promise<PieceHistoryDto[]> {
  const rows = await db('events as e').leftJoin('users as u', 'u.id', 'e.actor_id')
    .select('e.type', 'e.at', 'e.data', 'u.name').where({ 'e.workshop_id': workshopId, 'e.entity': 'piece', 'e.entity_id': String(pieceId) })
    .orderBy([{ column: 'e.at', order: 'asc' }, { column: 'e.id', order: 'asc' }])
  return rows.map((e) => {
    const kind = String(e.type).replace(/^piece\./, '')
    const data = (e.data ?? {}) as { reason?: string | null; notes?: string | null; override?: boolean }
    return {
      kind: KINDS.has(kind) ? kind as FinishingActionKind : kind === 'created' || kind === 'dispatched' ? kind : 'other',
      at: iso(e.at)!, by: e.name, note: data.reason ?? data.notes ?? null, override: data.override === true,
    }
  })
}

/** One piece of the workshop as its card, or a 404 naming nothing of another workshop. */
export async function pieceCard(db: Knex, workshopId: number, id: number): Promise<FinishingPieceDto> {
  const [piece] = await pieceDtos(db, workshopId, [id])
  if (!piece) notFound('The piece')
  return piece
}

export async function pieceStory(actor: Actor, id: number): Promise<PieceStoryDto> {
  const db = useDb()
  const ws = await loadWorkshop(db, actor.workshopId)
  const piece = await pieceCard(db, ws.id, id)
  const [pour, weighings, photos, history, places, labels, dispatch] = await Promise.all([
    pourOf(db, ws.id, id),
    weighingsOf(db, ws.id, id, piece.dryMassKg),
    db('photos').select('id', 'caption', 'created_at').where({ workshop_id: ws.id, piece_id: id }).orderBy('created_at'),
    historyOf(db, ws.id, id),
    piecePlaces(db, ws.id, [id]),
    pieceLabelsRepo.live(db, ws.id, [id]),
    piece.dispatchId
      ? db('dispatches').first('id', 'note_no', 'dispatched_at').where({ workshop_id: ws.id, id: piece.dispatchId })
      : Promise.resolve(undefined),
  ])
  return {
    timezone: ws.timezone,
    piece,
    pour,
    place: places.get(id) ?? null,
    weighings,
    photos: photos.map(p => ({ id: p.id, caption: p.caption, createdAt: iso(p.created_at)! })),
    history,
    nextSteps: pieceNextSteps(piece.state),
    dispatch: dispatch ? { id: Number(dispatch.id), noteNo: dispatch.note_no, dispatchedAt: iso(dispatch.dispatched_at)! } : null,
    label: labels[0] ? { createdAt: iso(labels[0].created_at)! } : null,
  }
}
