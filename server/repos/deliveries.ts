// Every knex call for deliveries and delivery_pieces: booking, the proof of delivery, a job's
// deliveries, one delivery with its pieces, and the days a calendar feed lists. Workshop in
// every WHERE.
import type { Knex } from 'knex'
import { LOAD_PIECE_SQL, type LoadPieceRow } from './crates'

export interface DeliveryRow {
  id: number
  job_id: number
  site_id: number | null
  delivery_day: string
  fixing_on: string | null
  vehicle: string
  state: 'booked' | 'delivered'
  delivered_at: Date | null
  receiver_name: string | null
  photo_id: string | null
  dispatch_id: number | null
  version: number
}

/** A delivery as a calendar feed words it. */
export interface FeedDeliveryRow {
  id: number
  delivery_day: string
  fixing_on: string | null
  vehicle: string
  state: string
  job_code: string
  job_title: string
  site_name: string | null
  site_address: string | null
  site_postcode: string | null
  pieces: number
}

export type DeliveryPieceRow = LoadPieceRow & { crate_no: number | null; broken: boolean; broken_note: string | null }

const SELECT = `SELECT d.id, d.job_id, d.site_id, to_char(d.delivery_day, 'YYYY-MM-DD') AS delivery_day, to_char(d.fixing_on, 'YYYY-MM-DD') AS fixing_on,
  d.vehicle, d.state, d.delivered_at, d.receiver_name, d.photo_id, d.dispatch_id, d.version FROM deliveries d`

const asRow = (r: Record<string, unknown>): DeliveryRow => ({
  ...(r as unknown as DeliveryRow), id: Number(r.id), job_id: Number(r.job_id), site_id: r.site_id === null ? null : Number(r.site_id),
  dispatch_id: r.dispatch_id === null ? null : Number(r.dispatch_id),
})

export const deliveriesRepo = {
  async insert(db: Knex, workshopId: number, d: { jobId: number; siteId: number | null; deliveryDay: string; fixingOn: string | null; vehicle: string; by: number }) {
    const [row] = await db('deliveries').insert({
      workshop_id: workshopId, job_id: d.jobId, site_id: d.siteId, delivery_day: d.deliveryDay, fixing_on: d.fixingOn, vehicle: d.vehicle, booked_by: d.by,
    }).returning('id')
    return Number(row.id)
  },
  /** The pieces that go, each with the crate it travels in (null: loose). */
  async addPieces(db: Knex, workshopId: number, deliveryId: number, pieces: { pieceId: number; crateNo: number | null }[]) {
    if (!pieces.length) return
    await db('delivery_pieces').insert(pieces.map(p => ({ workshop_id: workshopId, delivery_id: deliveryId, piece_id: p.pieceId, crate_no: p.crateNo })))
  },
  /** Pieces already booked on a delivery, of these. */
  async alreadyBooked(db: Knex, workshopId: number, pieceIds: number[]): Promise<number[]> {
    if (!pieceIds.length) return []
    const rows = await db('delivery_pieces').select('piece_id').where({ workshop_id: workshopId }).whereIn('piece_id', pieceIds)
    return rows.map(r => Number(r.piece_id))
  },
  async byId(db: Knex, workshopId: number, id: number): Promise<DeliveryRow | undefined> {
    const r = await db.raw(`${SELECT} WHERE d.workshop_id = ? AND d.id = ?`, [workshopId, id])
    return r.rows[0] ? asRow(r.rows[0]) : undefined
  },
  async forUpdate(db: Knex, workshopId: number, id: number): Promise<DeliveryRow | undefined> {
    const r = await db.raw(`${SELECT} WHERE d.workshop_id = ? AND d.id = ? FOR UPDATE`, [workshopId, id])
    return r.rows[0] ? asRow(r.rows[0]) : undefined
  },
  async ofJob(db: Knex, workshopId: number, jobId: number): Promise<DeliveryRow[]> {
    const r = await db.raw(`${SELECT} WHERE d.workshop_id = ? AND d.job_id = ? ORDER BY d.delivery_day DESC, d.id DESC`, [workshopId, jobId])
    return r.rows.map(asRow)
  },
  /** The pieces of deliveries, by delivery, with their handling weights and what broke. */
  async pieces(db: Knex, workshopId: number, deliveryIds: number[]): Promise<(DeliveryPieceRow & { delivery_id: number })[]> {
    if (!deliveryIds.length) return []
    const r = await db.raw(`SELECT x.*, dp.delivery_id, dp.crate_no, dp.broken, dp.broken_note FROM delivery_pieces dp
      JOIN (${LOAD_PIECE_SQL}) x ON x.id = dp.piece_id
      WHERE dp.workshop_id = :workshopId AND dp.delivery_id = ANY(:deliveryIds) ORDER BY dp.crate_no NULLS LAST, x.mark`, { workshopId, deliveryIds })
    return r.rows.map((x: DeliveryPieceRow & { delivery_id: number }) => ({ ...x, id: Number(x.id), delivery_id: Number(x.delivery_id) }))
  },
  async signature(db: Knex, workshopId: number, id: number): Promise<Buffer | null> {
    const row = await db('deliveries').first('signature_png').where({ workshop_id: workshopId, id })
    return (row?.signature_png as Buffer | null) ?? null
  },
  /** The proof of delivery, when the row is still at the version read (under its lock). */
  async deliver(db: Knex, workshopId: number, id: number, p: { at: Date; receiverName: string; signature: Buffer; photoId: string | null; dispatchId: number; by: number }) {
    await db('deliveries').where({ workshop_id: workshopId, id, state: 'booked' }).update({
      state: 'delivered', delivered_at: p.at.toISOString(), receiver_name: p.receiverName, signature_png: p.signature, photo_id: p.photoId,
      dispatch_id: p.dispatchId, signed_by: p.by, version: db.raw('version + 1'),
    })
  },
  async markBroken(db: Knex, workshopId: number, id: number, broken: { pieceId: number; note: string | null }[]) {
    for (const b of broken) {
      await db('delivery_pieces').where({ workshop_id: workshopId, delivery_id: id, piece_id: b.pieceId }).update({ broken: true, broken_note: b.note })
    }
  },
  /** Deliveries for a calendar feed: the workshop's, or one job's, with job and site for the event's words. */
  async forFeed(db: Knex, workshopId: number, jobId: number | null) {
    const r = await db.raw(`SELECT d.id, to_char(d.delivery_day, 'YYYY-MM-DD') AS delivery_day, to_char(d.fixing_on, 'YYYY-MM-DD') AS fixing_on,
        d.vehicle, d.state, j.code AS job_code, j.title AS job_title, s.name AS site_name, s.address AS site_address, s.postcode AS site_postcode,
        (SELECT count(*)::int FROM delivery_pieces dp WHERE dp.workshop_id = d.workshop_id AND dp.delivery_id = d.id) AS pieces
      FROM deliveries d
      JOIN jobs j ON j.id = d.job_id AND j.workshop_id = d.workshop_id
      LEFT JOIN client_sites s ON s.id = d.site_id AND s.workshop_id = d.workshop_id
      WHERE d.workshop_id = :workshopId AND (:jobId::bigint IS NULL OR d.job_id = :jobId::bigint)
      ORDER BY d.delivery_day, d.id`, { workshopId, jobId })
    return r.rows.map((x: Record<string, unknown>) => ({ ...x, id: Number(x.id) })) as FeedDeliveryRow[]
  },
}
