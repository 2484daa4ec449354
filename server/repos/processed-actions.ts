// Every knex call for processed_actions: the ids of actions the server has answered, with the
// answer, so an action replayed from a tablet's outbox runs exactly once.
import type { Knex } from 'knex'

export interface ProcessedAction { id: string; workshop_id: number; user_id: number | null; kind: string; entity_id: number | null; status: number; result: unknown }

export const processedActionsRepo = {
  /** Answers older than `days`: a tablet's outbox replays within hours, so their use is over. */
  deleteOld(db: Knex, days: number): Promise<number> {
    return db('processed_actions').where('created_at', '<', db.raw(`now() - make_interval(days => ?)`, [days])).delete()
  },
  /**
   * Serialises requests that carry the same action id until the transaction ends (a
   * transaction-level advisory lock on the id's hash), so two copies of one action sent at
   * once cannot both run: the second waits, then finds the first's answer.
   */
  async lock(db: Knex, id: string) {
    await db.raw('SELECT pg_advisory_xact_lock(hashtextextended(?, 0))', [id])
  },
  async find(db: Knex, id: string): Promise<ProcessedAction | undefined> {
    const row = await db('processed_actions').first('id', 'workshop_id', 'user_id', 'kind', 'entity_id', 'status', 'result').where({ id })
    const num = (v: unknown) => (v === null ? null : Number(v))
    return row ? { ...row, workshop_id: Number(row.workshop_id), user_id: num(row.user_id), entity_id: num(row.entity_id) } : undefined
  },
  async insert(db: Knex, a: { id: string; workshopId: number; userId: number; kind: string; entityId: number; status: number; result: unknown }) {
    await db('processed_actions').insert({
      id: a.id, workshop_id: a.workshopId, user_id: a.userId, kind: a.kind, entity_id: a.entityId, status: a.status, result: JSON.stringify(a.result),
    }).onConflict('id').ignore()
  },
}
