// Every knex call for piece_labels: the live label of a piece (drawn once, under the piece's
// row lock), a token's label with its piece, revoking. Workshop in every WHERE.
import type { Knex } from 'knex'

export interface PieceLabelRow {
  id: number
  piece_id: number
  token: string
  created_at: Date
  revoked_at: Date | null
}

const COLUMNS = ['id', 'piece_id', 'token', 'created_at', 'revoked_at'] as const
const asRow = (r: PieceLabelRow) => ({ ...r, id: Number(r.id), piece_id: Number(r.piece_id) })

export const pieceLabelsRepo = {
  /** The live labels of some pieces. */
  async live(db: Knex, workshopId: number, pieceIds: number[]): Promise<PieceLabelRow[]> {
    if (!pieceIds.length) return []
    const rows = await db('piece_labels').select(...COLUMNS).where({ workshop_id: workshopId }).whereIn('piece_id', pieceIds).whereNull('revoked_at')
    return rows.map(asRow)
  },
  /** A new live label; ON CONFLICT leaves the one another print drew at the same moment (the caller reads it again). */
  async insert(db: Knex, workshopId: number, pieceId: number, token: string, by: number) {
    await db.raw(`INSERT INTO piece_labels (workshop_id, piece_id, token, created_by) VALUES (?, ?, ?, ?)
      ON CONFLICT (piece_id) WHERE revoked_at IS NULL DO NOTHING`, [workshopId, pieceId, token, by])
  },
  /** A token's label, live or revoked, within the workshop. */
  async byToken(db: Knex, workshopId: number, token: string): Promise<PieceLabelRow | undefined> {
    const row = await db('piece_labels').first(...COLUMNS).where({ workshop_id: workshopId, token })
    return row ? asRow(row) : undefined
  },
  /** Revokes the piece's live labels; how many there were. */
  async revoke(db: Knex, workshopId: number, pieceId: number, by: number): Promise<number> {
    return db('piece_labels').where({ workshop_id: workshopId, piece_id: pieceId }).whereNull('revoked_at')
      .update({ revoked_at: db.fn.now(), revoked_by: by })
  },
}
