// Every knex call for crates and crate_pieces: numbering a job's crates, packing pieces into
// them, the crates of a job with their pieces' handling weights. Workshop in every WHERE.
import type { Knex } from 'knex'
import type { FinishingPieceState } from '#shared/utils/finishing-steps'

export interface CrateRow { id: number; job_id: number; crate_no: number; delivery_id: number | null; version: number }

/** A piece with what a crate or a delivery shows of it: the last weighing, else its computed dry mass. */
export interface LoadPieceRow {
  id: number
  mark: string
  item: string | null
  state: FinishingPieceState
  dry_mass_kg: string
  weighed_kg: string | null
  crate_id: number | null
  job_id: number | null
}

/** The pieces' columns and joins shared with the delivery repo (c = pieces). */
export const LOAD_PIECE_SQL = `SELECT c.id, c.mark, i.description AS item, c.state, c.dry_mass_kg, lw.weighed_kg, cp.crate_id, i.job_id
  FROM pieces c
  LEFT JOIN job_items i ON i.id = c.job_item_id AND i.workshop_id = c.workshop_id
  LEFT JOIN crate_pieces cp ON cp.piece_id = c.id AND cp.workshop_id = c.workshop_id
  LEFT JOIN LATERAL (SELECT w.weighed_kg FROM piece_weighings w WHERE w.piece_id = c.id AND w.workshop_id = c.workshop_id
    ORDER BY w.weighed_at DESC, w.id DESC LIMIT 1) lw ON true
  WHERE c.workshop_id = :workshopId`

const asCrate = (r: Record<string, unknown>): CrateRow => ({
  id: Number(r.id), job_id: Number(r.job_id), crate_no: Number(r.crate_no), delivery_id: r.delivery_id === null ? null : Number(r.delivery_id), version: Number(r.version),
})
const asPiece = (r: LoadPieceRow): LoadPieceRow => ({ ...r, id: Number(r.id), crate_id: r.crate_id === null ? null : Number(r.crate_id), job_id: r.job_id === null ? null : Number(r.job_id) })

export const cratesRepo = {
  /**
   * A new crate numbered one more than the job's highest. The job row is locked first, so two
   * crates made at once number one after the other (the unique index would refuse the second).
   */
  async insert(db: Knex, workshopId: number, jobId: number, by: number): Promise<CrateRow> {
    await db('jobs').first('id').where({ workshop_id: workshopId, id: jobId }).forUpdate()
    const r = await db('crates').where({ workshop_id: workshopId, job_id: jobId }).max({ n: 'crate_no' }).first()
    const [row] = await db('crates').insert({ workshop_id: workshopId, job_id: jobId, crate_no: Number(r?.n ?? 0) + 1, created_by: by })
      .returning(['id', 'job_id', 'crate_no', 'delivery_id', 'version'])
    return asCrate(row)
  },
  async forUpdate(db: Knex, workshopId: number, id: number): Promise<CrateRow | undefined> {
    const row = await db('crates').first('id', 'job_id', 'crate_no', 'delivery_id', 'version').where({ workshop_id: workshopId, id }).forUpdate()
    return row ? asCrate(row) : undefined
  },
  async byId(db: Knex, workshopId: number, id: number): Promise<CrateRow | undefined> {
    const row = await db('crates').first('id', 'job_id', 'crate_no', 'delivery_id', 'version').where({ workshop_id: workshopId, id })
    return row ? asCrate(row) : undefined
  },
  /** Several crates locked in id order (two deliveries taking overlapping crates cannot deadlock). */
  async lockMany(db: Knex, workshopId: number, ids: number[]): Promise<CrateRow[]> {
    if (!ids.length) return []
    const rows = await db('crates').select('id', 'job_id', 'crate_no', 'delivery_id', 'version').where({ workshop_id: workshopId }).whereIn('id', ids).orderBy('id').forUpdate()
    return rows.map(asCrate)
  },
  ofJob(db: Knex, workshopId: number, jobId: number): Promise<CrateRow[]> {
    return db('crates').select('id', 'job_id', 'crate_no', 'delivery_id', 'version').where({ workshop_id: workshopId, job_id: jobId }).orderBy('crate_no')
      .then(rows => rows.map(asCrate))
  },
  /** Puts pieces into a crate (a piece in another crate moves) and moves the crate's version on. */
  async pack(db: Knex, workshopId: number, crateId: number, pieceIds: number[]) {
    if (!pieceIds.length) return
    await db('crate_pieces').insert(pieceIds.map(p => ({ workshop_id: workshopId, crate_id: crateId, piece_id: p })))
      .onConflict('piece_id').merge(['crate_id'])
    await db('crates').where({ workshop_id: workshopId, id: crateId }).update({ version: db.raw('version + 1') })
  },
  /** Books crates on a delivery. */
  async book(db: Knex, workshopId: number, ids: number[], deliveryId: number) {
    if (!ids.length) return
    await db('crates').where({ workshop_id: workshopId }).whereIn('id', ids).update({ delivery_id: deliveryId, version: db.raw('version + 1') })
  },
  /** Pieces by id with their crate and handling weight. */
  async pieces(db: Knex, workshopId: number, ids: number[]): Promise<LoadPieceRow[]> {
    if (!ids.length) return []
    const r = await db.raw(`${LOAD_PIECE_SQL} AND c.id = ANY(:ids) ORDER BY c.mark`, { workshopId, ids })
    return r.rows.map(asPiece)
  },
  /** The pieces in some crates. */
  async piecesIn(db: Knex, workshopId: number, crateIds: number[]): Promise<LoadPieceRow[]> {
    if (!crateIds.length) return []
    const r = await db.raw(`${LOAD_PIECE_SQL} AND cp.crate_id = ANY(:crateIds) ORDER BY c.mark`, { workshopId, crateIds })
    return r.rows.map(asPiece)
  },
  /** The job's ready or packed pieces in no crate and on no delivery: what can still be packed. */
  async loose(db: Knex, workshopId: number, jobId: number): Promise<LoadPieceRow[]> {
    const r = await db.raw(`${LOAD_PIECE_SQL} AND i.job_id = :jobId AND c.state IN ('ready', 'packed') AND cp.crate_id IS NULL
      AND NOT EXISTS (SELECT 1 FROM delivery_pieces dp WHERE dp.workshop_id = c.workshop_id AND dp.piece_id = c.id) ORDER BY c.mark`, { workshopId, jobId })
    return r.rows.map(asPiece)
  },
  /** The heaviest crate the workshop packs, kg (workshop settings). */
  async maxKg(db: Knex, workshopId: number): Promise<number> {
    const row = await db('workshops').first('crate_max_kg').where({ id: workshopId })
    return Number(row?.crate_max_kg ?? 0)
  },
  /** The job's heading on a label: client and site. */
  jobHeading(db: Knex, workshopId: number, jobId: number): Promise<{ id: number; code: string; title: string; client: string | null; site: string | null; site_id: number | null } | undefined> {
    return db('jobs as j')
      .leftJoin('client_orgs as o', function () {
        this.on('o.id', 'j.client_org_id').andOn('o.workshop_id', 'j.workshop_id')
      })
      .leftJoin('client_sites as s', function () {
        this.on('s.id', 'j.site_id').andOn('s.workshop_id', 'j.workshop_id')
      })
      .first('j.id', 'j.code', 'j.title', 'o.name as client', db.raw('coalesce(s.name, j.site) AS site'), 'j.site_id')
      .where({ 'j.workshop_id': workshopId, 'j.id': jobId })
      .then(r => r ? { ...r, id: Number(r.id), site_id: r.site_id === null ? null : Number(r.site_id) } : undefined)
  },
}
