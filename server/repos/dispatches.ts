// Every knex call for dispatches: note numbers, the note, its pieces with their handling
// weights. Workshop in every WHERE.
import type { Knex } from 'knex'

export interface DispatchRow {
  id: number
  job_id: number
  note_no: string
  dispatched_at: Date
  dispatched_by_name: string | null
  notes: string | null
}

export interface DispatchPieceRow {
  id: number
  mark: string
  item_description: string | null
  mould_code: string
  dry_mass_kg: string
  weighed_kg: string | null
}

export interface DispatchInvoicePieceRow {
  mark: string
  item_id: number | null
  item_description: string | null
  pieces_needed: number | null
  price_minor: number | null
  mould_code: string
}

const SUMMARY_COLUMNS = ['d.id', 'd.job_id', 'd.note_no', 'd.dispatched_at', 'd.notes', 'u.name as dispatched_by_name']

export const dispatchesRepo = {
  /**
   * The workshop's next note number for a year: DN-YYYY-0001, DN-YYYY-0002… An advisory lock
   * on the workshop holds other notes of it back until this transaction ends, so two leads
   * never draw the same number (the unique index would refuse the second anyway).
   */
  async nextNoteNo(db: Knex, workshopId: number, year: string): Promise<string> {
    await db.raw('SELECT pg_advisory_xact_lock(hashtextextended(?, 0))', [`dispatch-note:${workshopId}`])
    const prefix = `DN-${year}-`
    const r = await db.raw(`SELECT coalesce(max(substring(note_no FROM '([0-9]+)$')::int), 0) AS n FROM dispatches
      WHERE workshop_id = ? AND note_no LIKE ?`, [workshopId, `${prefix}%`])
    return `${prefix}${String(Number(r.rows[0].n) + 1).padStart(4, '0')}`
  },
  async insert(db: Knex, workshopId: number, d: { jobId: number; noteNo: string; at: Date; by: number; notes: string | null }) {
    const [row] = await db('dispatches').insert({
      workshop_id: workshopId, job_id: d.jobId, note_no: d.noteNo, dispatched_at: d.at.toISOString(), dispatched_by: d.by, notes: d.notes,
    }).returning('id')
    return Number(row.id)
  },
  async byId(db: Knex, workshopId: number, id: number): Promise<DispatchRow | undefined> {
    const row = await db('dispatches as d').leftJoin('users as u', 'u.id', 'd.dispatched_by')
      .first(SUMMARY_COLUMNS).where({ 'd.workshop_id': workshopId, 'd.id': id })
    return row ? { ...row, id: Number(row.id), job_id: Number(row.job_id) } : undefined
  },
  async ofJob(db: Knex, workshopId: number, jobId: number): Promise<(DispatchRow & { pieces: number; total_kg: string })[]> {
    const rows = await db('dispatches as d').leftJoin('users as u', 'u.id', 'd.dispatched_by')
      .select(SUMMARY_COLUMNS)
      .select(db.raw(`(SELECT count(*)::int FROM pieces c WHERE c.workshop_id = d.workshop_id AND c.dispatch_id = d.id) AS pieces`))
      .select(db.raw(`(SELECT coalesce(sum(coalesce(lw.weighed_kg, c.dry_mass_kg)), 0) FROM pieces c
          LEFT JOIN LATERAL (SELECT w.weighed_kg FROM piece_weighings w WHERE w.piece_id = c.id AND w.workshop_id = c.workshop_id
            ORDER BY w.weighed_at DESC, w.id DESC LIMIT 1) lw ON true
          WHERE c.workshop_id = d.workshop_id AND c.dispatch_id = d.id) AS total_kg`))
      .where({ 'd.workshop_id': workshopId, 'd.job_id': jobId }).orderBy([{ column: 'd.dispatched_at', order: 'desc' }, { column: 'd.id', order: 'desc' }])
    return rows.map(r => ({ ...r, id: Number(r.id), job_id: Number(r.job_id) }))
  },
  /** The note's pieces with their last weighing (what they weighed dry), by mark. */
  async pieces(db: Knex, workshopId: number, dispatchId: number): Promise<DispatchPieceRow[]> {
    const r = await db.raw(`SELECT c.id, c.mark, i.description AS item_description, m.code AS mould_code, c.dry_mass_kg, lw.weighed_kg
      FROM pieces c
      JOIN pours p ON p.id = c.pour_id AND p.workshop_id = c.workshop_id
      JOIN moulds m ON m.id = p.mould_id AND m.workshop_id = c.workshop_id
      LEFT JOIN job_items i ON i.id = c.job_item_id AND i.workshop_id = c.workshop_id
      LEFT JOIN LATERAL (SELECT w.weighed_kg FROM piece_weighings w WHERE w.piece_id = c.id AND w.workshop_id = c.workshop_id
        ORDER BY w.weighed_at DESC, w.id DESC LIMIT 1) lw ON true
      WHERE c.workshop_id = ? AND c.dispatch_id = ? ORDER BY c.mark`, [workshopId, dispatchId])
    return r.rows.map((x: DispatchPieceRow) => ({ ...x, id: Number(x.id) }))
  },
  /**
   * The note's pieces with the item each was cast for: its description, the pieces it needs and
   * the client's price of it (an invoice's lines, shared/utils/invoice-lines.ts), in the job's
   * item order, then by mark.
   */
  async invoicePieces(db: Knex, workshopId: number, dispatchId: number): Promise<DispatchInvoicePieceRow[]> {
    const r = await db.raw(`SELECT c.mark, i.id AS item_id, i.description AS item_description, i.pieces_needed, i.price_minor, m.code AS mould_code
      FROM pieces c
      JOIN pours p ON p.id = c.pour_id AND p.workshop_id = c.workshop_id
      JOIN moulds m ON m.id = p.mould_id AND m.workshop_id = c.workshop_id
      LEFT JOIN job_items i ON i.id = c.job_item_id AND i.workshop_id = c.workshop_id
      WHERE c.workshop_id = ? AND c.dispatch_id = ?
      ORDER BY i.sort_order NULLS LAST, i.id NULLS LAST, m.code, c.mark`, [workshopId, dispatchId])
    return r.rows.map((x: DispatchInvoicePieceRow) => ({
      ...x, item_id: x.item_id === null ? null : Number(x.item_id), price_minor: x.price_minor === null ? null : Number(x.price_minor),
      pieces_needed: x.pieces_needed === null ? null : Number(x.pieces_needed),
    }))
  },
  /** The job's heading on the note: client organisation and site. */
  jobHeading(db: Knex, workshopId: number, jobId: number) {
    return db('jobs as j').leftJoin('client_orgs as o', function () {
      this.on('o.id', 'j.client_org_id').andOn('o.workshop_id', 'j.workshop_id')
    }).first('j.id', 'j.code', 'j.title', 'j.site', 'o.name as client').where({ 'j.workshop_id': workshopId, 'j.id': jobId })
  },
}
