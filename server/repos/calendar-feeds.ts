// Every knex call for calendar_feeds: a feed link is made (its secret's SHA-256 kept), listed,
// revoked, and found by its secret while not revoked. Workshop in every WHERE but the lookup by
// secret, which is how the workshop is known.
import type { Knex } from 'knex'

export interface CalendarFeedRow { id: number; workshop_id: number; job_id: number | null; job_code: string | null; created_at: Date; revoked_at: Date | null }

const asRow = (r: Record<string, unknown>): CalendarFeedRow => ({
  ...(r as unknown as CalendarFeedRow), id: Number(r.id), workshop_id: Number(r.workshop_id), job_id: r.job_id === null ? null : Number(r.job_id),
})

export const calendarFeedsRepo = {
  async insert(db: Knex, workshopId: number, f: { jobId: number | null; tokenHash: string; by: number }): Promise<number> {
    const [row] = await db('calendar_feeds').insert({ workshop_id: workshopId, job_id: f.jobId, token_hash: f.tokenHash, created_by: f.by }).returning('id')
    return Number(row.id)
  },
  async list(db: Knex, workshopId: number): Promise<CalendarFeedRow[]> {
    const rows = await db('calendar_feeds as f').leftJoin('jobs as j', function () {
      this.on('j.id', 'f.job_id').andOn('j.workshop_id', 'f.workshop_id')
    }).select('f.id', 'f.workshop_id', 'f.job_id', 'j.code as job_code', 'f.created_at', 'f.revoked_at')
      .where({ 'f.workshop_id': workshopId }).orderBy([{ column: 'f.created_at', order: 'desc' }, { column: 'f.id', order: 'desc' }])
    return rows.map(asRow)
  },
  async byId(db: Knex, workshopId: number, id: number): Promise<CalendarFeedRow | undefined> {
    return (await this.list(db, workshopId)).find(f => f.id === id)
  },
  /** Revokes a feed; false when the workshop has no such feed. Revoking twice keeps the first date. */
  async revoke(db: Knex, workshopId: number, id: number): Promise<boolean> {
    const n = await db('calendar_feeds').where({ workshop_id: workshopId, id })
      .update({ revoked_at: db.raw('coalesce(revoked_at, now())') })
    return n === 1
  },
  /** The live feed a secret opens, or nothing (unknown or revoked). */
  async live(db: Knex, tokenHash: string): Promise<CalendarFeedRow | undefined> {
    const row = await db('calendar_feeds').first('id', 'workshop_id', 'job_id', 'created_at', 'revoked_at')
      .where({ token_hash: tokenHash }).whereNull('revoked_at')
    return row ? asRow({ ...row, job_code: null }) : undefined
  },
}
