// Every knex call for pieces and piece_weighings: the finisher's steps, the queue's reads with
// job, item, mould and the last weighing, and the job-ready count. Workshop in every WHERE.
import type { Knex } from 'knex'
import { dryingThicknessMm, mouldCastFromRow } from '#shared/utils/plaster-fibrous'
import type { FinishingPieceState } from '#shared/utils/finishing-steps'

export interface PieceRow {
  id: number
  version: number
  state: FinishingPieceState
  mark: string
  pour_id: number
  job_item_id: number | null
  dry_mass_kg: number
  wet_mass_kg: number
  dry_by: Date | null
  dispatch_id: number | null
}

const ROW_COLUMNS = ['id', 'version', 'state', 'mark', 'pour_id', 'job_item_id', 'dry_mass_kg', 'wet_mass_kg', 'dry_by', 'dispatch_id'] as const

/** One piece as the queue reads it: with its job, item, mould and its latest weighing since it last went to drying. */
export interface PieceViewRow {
  id: number
  version: number
  mark: string
  state: FinishingPieceState
  dry_mass_kg: number
  wet_mass_kg: number
  dry_by: Date | null
  drying_temp_c: number | null
  drying_humidity_pct: number | null
  reason: string | null
  dispatch_id: number | null
  created_at: Date
  demoulded_at: Date | null
  mould_code: string
  mould_casts: string
  cavity_litres: number
  cast_type: string
  shell_thickness_mm: number | null
  item_id: number | null
  item_description: string | null
  job_id: number | null
  job_code: string | null
  job_title: string | null
  job_due_on: string | null
  weighed_kg: number | null
  weighed_at: Date | null
  /** the current drying spell's weighings, oldest first (json: weighed_at as text) */
  spell_weighings: { kg: number | string; at: string }[]
  plaster_kg_planned: number | string | null
  plaster_kg_actual: number | string | null
  timer_type: string | null
  timer_at: Date | null
  timer_by: number | null
  timer_by_name: string | null
}

/**
 * The piece's current drying spell: weighings from its last fettling on. A weighing from before
 * a repair (and the piece's second fettling) says nothing about how wet it is now.
 */
const IN_SPELL = `w.piece_id = c.id AND w.workshop_id = c.workshop_id
      AND w.weighed_at >= coalesce((SELECT max(e.at) FROM events e WHERE e.workshop_id = c.workshop_id AND e.entity = 'piece'
        AND e.entity_id = c.id::text AND e.type = 'piece.fettled'), '-infinity')`

/** The spell's latest weighing, and its last 20 weighings (oldest first) for the constant-weight test. */
const LAST_WEIGHING = `LEFT JOIN LATERAL (
    SELECT w.weighed_kg, w.weighed_at FROM piece_weighings w WHERE ${IN_SPELL}
    ORDER BY w.weighed_at DESC, w.id DESC LIMIT 1) lw ON true
  LEFT JOIN LATERAL (
    SELECT coalesce(json_agg(json_build_object('kg', x.weighed_kg, 'at', x.weighed_at) ORDER BY x.weighed_at, x.id), '[]'::json) AS spell_weighings
    FROM (SELECT w.id, w.weighed_kg, w.weighed_at FROM piece_weighings w WHERE ${IN_SPELL}
      ORDER BY w.weighed_at DESC, w.id DESC LIMIT 20) x) sw ON true`

/**
 * The finisher's clock on the piece: its latest timing step (or a step that ends the work). A
 * start there means fettling or repair is being timed now, by whom and since when.
 */
const TIMER_TYPES = `('piece.fettle_start', 'piece.fettle_stop', 'piece.fettled', 'piece.repair_start', 'piece.repair_stop',
  'piece.repaired', 'piece.rejected', 'piece.repair')`
const LAST_TIMER = `LEFT JOIN LATERAL (
    SELECT e.type AS timer_type, e.at AS timer_at, e.actor_id AS timer_by, u.name AS timer_by_name FROM events e
    LEFT JOIN users u ON u.id = e.actor_id
    WHERE e.workshop_id = c.workshop_id AND e.entity = 'piece' AND e.entity_id = c.id::text AND e.type IN ${TIMER_TYPES}
    ORDER BY e.at DESC, e.id DESC LIMIT 1) lt ON true`

const VIEW_SQL = `SELECT c.id, c.version, c.mark, c.state, c.dry_mass_kg, c.wet_mass_kg, c.dry_by, c.drying_temp_c, c.drying_humidity_pct,
    c.reason, c.dispatch_id, c.created_at, p.demoulded_at, m.code AS mould_code, m.casts AS mould_casts, m.cavity_litres, m.cast_type, m.shell_thickness_mm,
    i.id AS item_id, i.description AS item_description, j.id AS job_id, j.code AS job_code, j.title AS job_title,
    to_char(j.due_on, 'YYYY-MM-DD') AS job_due_on, lw.weighed_kg, lw.weighed_at, sw.spell_weighings,
    p.plaster_kg_planned, p.plaster_kg_actual, lt.timer_type, lt.timer_at, lt.timer_by, lt.timer_by_name
  FROM pieces c
  JOIN pours p ON p.id = c.pour_id AND p.workshop_id = c.workshop_id
  JOIN moulds m ON m.id = p.mould_id AND m.workshop_id = c.workshop_id
  LEFT JOIN job_items i ON i.id = c.job_item_id AND i.workshop_id = c.workshop_id
  LEFT JOIN jobs j ON j.id = i.job_id AND j.workshop_id = c.workshop_id
  ${LAST_WEIGHING}
  ${LAST_TIMER}
  WHERE c.workshop_id = :workshopId`

/** Most urgent job first (earliest due date; pieces of no job or no due date after), then the oldest cast. */
const QUEUE_ORDER = 'ORDER BY j.due_on NULLS LAST, coalesce(p.demoulded_at, c.created_at), c.id'

const asNumberId = <T extends { id: number | string }>(r: T) => ({ ...r, id: Number(r.id) })

export const piecesRepo = {
  /** Ready pieces put into a crate become packed, each moving its version on (packed ones stay as they are). */
  async packReady(db: Knex, workshopId: number, ids: number[]) {
    if (!ids.length) return
    await db('pieces').where({ workshop_id: workshopId, state: 'ready' }).whereIn('id', ids)
      .update({ state: 'packed', version: db.raw('version + 1'), updated_at: db.fn.now() })
  },
  /** Marks the pieces dispatched on a note, each moving its version on. */
  async dispatch(db: Knex, workshopId: number, ids: number[], dispatchId: number) {
    await db('pieces').where({ workshop_id: workshopId }).whereIn('id', ids)
      .update({ state: 'dispatched', dispatch_id: dispatchId, version: db.raw('version + 1'), updated_at: db.fn.now() })
  },
  async markTaken(db: Knex, workshopId: number, mark: string): Promise<boolean> {
    return !!(await db('pieces').first('id').where({ workshop_id: workshopId, mark }))
  },
  /**
   * The next piece number within a job for the mark scheme 'CODE#NNN': one more than the highest
   * such number among the job's marks. The job's row is locked first, so two demoulds of one job
   * at once number their pieces one after the other.
   */
  async nextInJob(db: Knex, workshopId: number, jobId: number, jobCode: string): Promise<number> {
    await db('jobs').first('id').where({ workshop_id: workshopId, id: jobId }).forUpdate()
    const prefix = `${jobCode}#`
    const r = await db('pieces').where({ workshop_id: workshopId })
      .whereRaw('left(mark, ?) = ?', [prefix.length, prefix])
      .whereRaw(`substr(mark, ?) ~ '^[0-9]+$'`, [prefix.length + 1])
      .first(db.raw('coalesce(max(substr(mark, ?)::int), 0) AS n', [prefix.length + 1]))
    return Number(r?.n ?? 0) + 1
  },
  /** A new piece from a demoulded pour. */
  async insert(db: Knex, workshopId: number, p: { pourId: number; jobItemId: number | null; mark: string; cavity?: number; dryMassKg: number; wetMassKg: number; state: FinishingPieceState }) {
    const [row] = await db('pieces').insert({
      workshop_id: workshopId, pour_id: p.pourId, job_item_id: p.jobItemId, mark: p.mark, cavity: p.cavity ?? 1, state: p.state,
      dry_mass_kg: p.dryMassKg, wet_mass_kg: p.wetMassKg,
    }).returning(['id', 'mark', 'state', 'dry_mass_kg', 'wet_mass_kg', 'version'])
    return { id: Number(row.id), mark: row.mark as string, state: row.state as FinishingPieceState, dryMassKg: Number(row.dry_mass_kg), wetMassKg: Number(row.wet_mass_kg), version: row.version as number }
  },
  async forUpdate(db: Knex, workshopId: number, id: number): Promise<PieceRow | undefined> {
    const row = await db('pieces').first(...ROW_COLUMNS).where({ workshop_id: workshopId, id }).forUpdate()
    return row ? asNumberId(row) : undefined
  },
  /** Several pieces locked in id order (so two notes taking overlapping pieces cannot deadlock). */
  async lockMany(db: Knex, workshopId: number, ids: number[]): Promise<PieceRow[]> {
    const rows = await db('pieces').select(...ROW_COLUMNS).where({ workshop_id: workshopId }).whereIn('id', ids).orderBy('id').forUpdate()
    return rows.map(asNumberId)
  },
  /** Writes one step when the version still matches; false when someone else moved it on. */
  async step(db: Knex, workshopId: number, id: number, version: number, patch: Record<string, unknown>): Promise<boolean> {
    const n = await db('pieces').where({ workshop_id: workshopId, id, version })
      .update({ ...patch, version: db.raw('version + 1'), updated_at: db.fn.now() })
    return n === 1
  },
  async addWeighing(db: Knex, workshopId: number, w: { pieceId: number; kg: number; at: Date; by: number }) {
    await db('piece_weighings').insert({ workshop_id: workshopId, piece_id: w.pieceId, weighed_kg: w.kg, weighed_at: w.at.toISOString(), weighed_by: w.by })
  },
  /**
   * The workshop's latest drying spells (newest first, at most `limit`): when each piece was put
   * to dry, the hours the estimate gave (and at factor 1, `base_hours`, when stored), and the
   * spell's weighings up to its end (a repair or rejection ends it), for the shop's falling-rate
   * factor. Only spells with two weighings or more can show constant weight.
   */
  async dryingSpells(db: Knex, workshopId: number, limit: number): Promise<{ fettled_at: Date; hours: string | null; base_hours: string | null; weighings: { kg: number | string; at: string }[] }[]> {
    const r = await db.raw(`SELECT e.at AS fettled_at, e.data->>'hours' AS hours, e.data->>'baseHours' AS base_hours, sw.weighings
      FROM events e
      CROSS JOIN LATERAL (
        SELECT json_agg(json_build_object('kg', w.weighed_kg, 'at', w.weighed_at) ORDER BY w.weighed_at, w.id) AS weighings, count(*) AS n
        FROM piece_weighings w
        WHERE w.workshop_id = e.workshop_id AND w.piece_id = e.entity_id::bigint AND w.weighed_at >= e.at
          AND w.weighed_at < coalesce((SELECT min(x.at) FROM events x WHERE x.workshop_id = e.workshop_id AND x.entity = 'piece'
            AND x.entity_id = e.entity_id AND x.type IN ('piece.repair', 'piece.rejected', 'piece.fettled') AND x.at > e.at), 'infinity')) sw
      WHERE e.workshop_id = ? AND e.entity = 'piece' AND e.type = 'piece.fettled' AND sw.n >= 2
      ORDER BY e.at DESC, e.id DESC LIMIT ?`, [workshopId, limit])
    return r.rows
  },
  /** When the piece's latest register entry happened (a new step may not be dated before it). */
  async lastEventAt(db: Knex, workshopId: number, id: number): Promise<Date | null> {
    const row = await db('events').max({ at: 'at' }).where({ workshop_id: workshopId, entity: 'piece', entity_id: String(id) }).first()
    return (row?.at as Date | null) ?? null
  },
  /** The piece's running timer (fettling or repair being timed), or null. */
  async runningTimer(db: Knex, workshopId: number, id: number): Promise<{ work: 'fettle' | 'repair'; by: number | null } | null> {
    const row = await db('events').first('type', 'actor_id').where({ workshop_id: workshopId, entity: 'piece', entity_id: String(id) })
      .whereRaw(`type IN ${TIMER_TYPES}`).orderBy([{ column: 'at', order: 'desc' }, { column: 'id', order: 'desc' }])
    if (row?.type === 'piece.fettle_start') return { work: 'fettle', by: row.actor_id === null ? null : Number(row.actor_id) }
    if (row?.type === 'piece.repair_start') return { work: 'repair', by: row.actor_id === null ? null : Number(row.actor_id) }
    return null
  },
  /** The cast's volume (its mould's cavity), for the drying estimate. */
  async cavityLitres(db: Knex, workshopId: number, pourId: number): Promise<number> {
    const row = await db('pours as p').join('moulds as m', function () {
      this.on('m.id', 'p.mould_id').andOn('m.workshop_id', 'p.workshop_id')
    }).first('m.cavity_litres').where({ 'p.workshop_id': workshopId, 'p.id': pourId })
    return Number(row.cavity_litres)
  },
  /** The section a piece dries through: its mould's cavity (or fibrous shell) litres and thickness (plaster-fibrous.ts). */
  async dryingSection(db: Knex, workshopId: number, pourId: number): Promise<{ cavityLitres: number; thicknessMm: number }> {
    const row = await db('pours as p').join('moulds as m', function () {
      this.on('m.id', 'p.mould_id').andOn('m.workshop_id', 'p.workshop_id')
    }).first('m.cavity_litres', 'm.cast_type', 'm.shell_thickness_mm').where({ 'p.workshop_id': workshopId, 'p.id': pourId })
    return { cavityLitres: Number(row.cavity_litres), thicknessMm: dryingThicknessMm(mouldCastFromRow(row)) }
  },
  async jobIdOfItem(db: Knex, workshopId: number, itemId: number | null): Promise<number | null> {
    if (!itemId) return null
    const row = await db('job_items').first('job_id').where({ workshop_id: workshopId, id: itemId })
    return row ? Number(row.job_id) : null
  },
  /** Locks the job row, so two pieces readied at once see each other before judging the job ready. */
  async lockJob(db: Knex, workshopId: number, jobId: number) {
    await db('jobs').first('id').where({ workshop_id: workshopId, id: jobId }).forUpdate()
  },
  /**
   * A job is ready for dispatch when it is open, has at least one item that needs pieces, and
   * every item has at least its pieces_needed pieces ready, packed or dispatched (rejected and
   * unfinished pieces do not count; spares beyond the need do no harm).
   */
  async jobReady(db: Knex, workshopId: number, jobId: number): Promise<boolean> {
    const r = await db.raw(`SELECT EXISTS (SELECT 1 FROM job_items i WHERE i.workshop_id = j.workshop_id AND i.job_id = j.id AND i.pieces_needed > 0)
        AND NOT EXISTS (SELECT 1 FROM job_items i WHERE i.workshop_id = j.workshop_id AND i.job_id = j.id
          AND i.pieces_needed > (SELECT count(*) FROM pieces c WHERE c.workshop_id = i.workshop_id AND c.job_item_id = i.id
            AND c.state IN ('ready', 'packed', 'dispatched'))) AS ready
      FROM jobs j WHERE j.workshop_id = ? AND j.id = ? AND j.state = 'open'`, [workshopId, jobId])
    return r.rows[0]?.ready === true
  },
  /** The pieces still in the finisher's hands (not dispatched, not rejected), queue order. */
  async open(db: Knex, workshopId: number): Promise<PieceViewRow[]> {
    const r = await db.raw(`${VIEW_SQL} AND c.state NOT IN ('dispatched', 'rejected') ${QUEUE_ORDER}`, { workshopId })
    return r.rows
  },
  async view(db: Knex, workshopId: number, ids: number[]): Promise<PieceViewRow[]> {
    if (!ids.length) return []
    const r = await db.raw(`${VIEW_SQL} AND c.id = ANY(:ids) ${QUEUE_ORDER}`, { workshopId, ids })
    return r.rows
  },
  /** A job's pieces in some states (the dispatch view's packed pieces). */
  async ofJob(db: Knex, workshopId: number, jobId: number, states: FinishingPieceState[]): Promise<PieceViewRow[]> {
    const r = await db.raw(`${VIEW_SQL} AND j.id = :jobId AND c.state = ANY(:states) ORDER BY c.mark`, { workshopId, jobId, states })
    return r.rows
  },
  async countOfJob(db: Knex, workshopId: number, jobId: number, state: FinishingPieceState): Promise<number> {
    const row = await db('pieces as c').join('job_items as i', function () {
      this.on('i.id', 'c.job_item_id').andOn('i.workshop_id', 'c.workshop_id')
    }).where({ 'c.workshop_id': workshopId, 'i.job_id': jobId, 'c.state': state }).count({ n: '*' }).first()
    return Number(row?.n ?? 0)
  },
}
