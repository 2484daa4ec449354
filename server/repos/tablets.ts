// tablet_devices: the shared tablets a lead signed in for the workshop. Only the SHA-256 of
// the device's cookie token is stored. updated_at moves on every switch, so it reads as
// "last used".
import type { Knex } from 'knex'

export interface TabletRow {
  id: number
  workshop_id: number
  name: string
  signed_in_by: number | null
  revoked_at: Date | null
  created_at: Date
  updated_at: Date
}

/** A tablet as the lead's list reads it: when it was last used and who signed it in. */
export interface TabletListRow { id: number; name: string; revoked_at: Date | null; created_at: Date; last_used_at: Date; signed_in_by_name: string | null }

const COLUMNS = ['id', 'workshop_id', 'name', 'signed_in_by', 'revoked_at', 'created_at', 'updated_at']

export const tabletsRepo = {
  async insert(db: Knex, row: { workshop_id: number; name: string; token_hash: string; signed_in_by: number }): Promise<TabletRow> {
    const [created] = await db('tablet_devices').insert(row).returning(COLUMNS)
    return created
  },
  /** byTokenHash for many tokens in one query, answers in the order asked (server/utils/session-checks.ts). */
  async byTokenHashes(db: Knex, tokenHashes: readonly string[]): Promise<(TabletRow | undefined)[]> {
    const rows: (TabletRow & { token_hash: string })[] = await db('tablet_devices').whereIn('token_hash', [...new Set(tokenHashes)]).select([...COLUMNS, 'token_hash'])
    const byHash = new Map(rows.map(({ token_hash, ...row }) => [token_hash, row]))
    return tokenHashes.map(h => byHash.get(h))
  },
  /** The device a cookie token belongs to, revoked or not (any workshop: the token is the key). */
  async byTokenHash(db: Knex, tokenHash: string): Promise<TabletRow | undefined> {
    const row: TabletRow | undefined = await db('tablet_devices').where({ token_hash: tokenHash }).first(COLUMNS)
    return row
  },
  /** The workshop's tablets, live ones first, with who signed each in. */
  list(db: Knex, workshopId: number): Promise<TabletListRow[]> {
    return db('tablet_devices as t').leftJoin('users as u', 'u.id', 't.signed_in_by')
      .where('t.workshop_id', workshopId)
      .select('t.id', 't.name', 't.revoked_at', 't.created_at', 't.updated_at as last_used_at', 'u.name as signed_in_by_name')
      .orderByRaw('t.revoked_at IS NOT NULL, t.created_at DESC')
  },
  /** Revokes a live tablet; undefined when it is not this workshop's or was already revoked. */
  async revoke(db: Knex, workshopId: number, id: number): Promise<TabletRow | undefined> {
    const [row] = await db('tablet_devices').where({ workshop_id: workshopId, id }).whereNull('revoked_at')
      .update({ revoked_at: db.fn.now(), updated_at: db.fn.now() }).returning(COLUMNS)
    return row
  },
  async byId(db: Knex, workshopId: number, id: number): Promise<TabletRow | undefined> {
    const row: TabletRow | undefined = await db('tablet_devices').where({ workshop_id: workshopId, id }).first(COLUMNS)
    return row
  },
  touch(db: Knex, id: number) {
    return db('tablet_devices').where({ id }).update({ updated_at: db.fn.now() })
  },
}
