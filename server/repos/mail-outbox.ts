// Every knex call for mail_outbox: queueing (deduplicated by dedupe_key, unique across all
// rows), the worker's batch and its outcome per mail, and the overdue-demould check's
// "not mailed yet" read.
import type { Knex } from 'knex'

export interface OutboxInsert {
  workshop_id: number | null
  user_id: number | null
  to_email: string
  kind: string
  subject: string
  text: string
  dedupe_key: string | null
}

export interface DueMailRow { id: number; workshop_id: number | null; to_email: string; subject: string; text: string; html: string | null; attempts: number }

/** A pour the lead has not been mailed about yet (an overdue demould or a missed start), with what the mail names. */
export interface LatePourRow { id: number; workshop_id: number; code: string; state: string; mix_at: Date; demould_close_at: Date; timezone: string; locale: string; job_code: string | null }

export const mailOutboxRepo = {
  /** A second mail with the same dedupe key is absorbed. */
  async insert(db: Knex, row: OutboxInsert) {
    await db('mail_outbox').insert(row).onConflict('dedupe_key').ignore()
  },
  /** Up to `limit` queued mails that are due, locked and skipping rows another worker holds. */
  due(trx: Knex, limit: number): Promise<DueMailRow[]> {
    return trx('mail_outbox').select('id', 'workshop_id', 'to_email', 'subject', 'text', 'html', 'attempts')
      .where('status', 'queued').where('next_attempt_at', '<=', trx.fn.now())
      .orderBy('id').limit(limit).forUpdate().skipLocked()
  },
  markSent(db: Knex, id: number, attempts: number) {
    return db('mail_outbox').where({ id }).update({ status: 'sent', sent_at: db.fn.now(), attempts, last_error: null })
  },
  /** A failed attempt: queued again after `retrySeconds`, or failed for good when `final`. */
  markFailed(db: Knex, id: number, attempts: number, final: boolean, error: string, retrySeconds: number) {
    return db('mail_outbox').where({ id }).update({
      attempts,
      status: final ? 'failed' : 'queued',
      last_error: error,
      next_attempt_at: db.raw(`now() + make_interval(secs => ?)`, [retrySeconds]),
    })
  },
  /**
   * Non-void pours still planned, mixing or setting whose demould window closed between
   * `since` and `now`, with no overdue mail queued yet (dedupe keys overdue:pourId:leadId),
   * across workshops (the periodic check), each row naming its own workshop.
   */
  /**
   * Pours the lead has not yet been mailed about: overdue demoulds (mixing or setting, window
   * closed) and missed starts (still planned past mix time plus `graceMs`), within `since`.
   */
  latePoursUnmailed(db: Knex, now: Date, since: Date, graceMs: number, limit: number): Promise<LatePourRow[]> {
    return db('pours as p')
      .join('moulds as m', function () {
        this.on('m.id', 'p.mould_id').andOn('m.workshop_id', 'p.workshop_id')
      })
      .join('workshops as w', 'w.id', 'p.workshop_id')
      .leftJoin('job_items as i', function () {
        this.on('i.id', 'p.job_item_id').andOn('i.workshop_id', 'p.workshop_id')
      })
      .leftJoin('jobs as j', function () {
        this.on('j.id', 'i.job_id').andOn('j.workshop_id', 'p.workshop_id')
      })
      .where(q => q
        .where(d => d.whereIn('p.state', ['mixing', 'setting']).where('p.demould_close_at', '<', now).where('p.demould_close_at', '>', since)
          .whereNotExists(db('mail_outbox as o').whereRaw(`o.dedupe_key LIKE 'overdue:' || p.id || ':%'`)))
        .orWhere(d => d.where('p.state', 'planned').where('p.mix_at', '<', new Date(now.getTime() - graceMs)).where('p.mix_at', '>', since)
          .whereNotExists(db('mail_outbox as o').whereRaw(`o.dedupe_key LIKE 'missed:' || p.id || ':%'`))))
      .select('p.id', 'p.workshop_id', 'm.code', 'p.state', 'p.mix_at', 'p.demould_close_at', 'w.timezone', 'w.locale', 'j.code as job_code')
      .orderBy('p.id').limit(limit)
  },
}
