// Every knex call for mail_outbox: queueing (deduplicated by dedupe_key, unique across all
// rows), the sender's claim and its outcome per mail, the readiness route's backlog, the clean-up, and the overdue-demould check's
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
  /** at most one attachment: its file name, media type and bytes (an invoice's PDF) */
  attachment_name?: string | null
  attachment_type?: string | null
  attachment?: Buffer | null
}

export interface DueMailRow { id: number; workshop_id: number | null; to_email: string; subject: string; text: string; html: string | null; attempts: number; message_token: string; attachment_name: string | null; attachment_type: string | null; attachment: Buffer | null }

/** A pour the lead has not been mailed about yet (an overdue demould or a missed start), with what the mail names. */
export interface LatePourRow { id: number; workshop_id: number; code: string; state: string; mix_at: Date; demould_close_at: Date; timezone: string; locale: string; job_code: string | null }

export const mailOutboxRepo = {
  /** A second mail with the same dedupe key is absorbed. */
  async insert(db: Knex, row: OutboxInsert) {
    await db('mail_outbox').insert(row).onConflict('dedupe_key').ignore()
  },
  /**
   * Claims up to `limit` due mails in one statement that commits on its own: queued ones whose
   * time has come, and claims another process let run out. Each comes back 'sending' with its
   * attempt counted; rows another claimer holds are skipped, so no mail is claimed twice.
   */
  async claimDue(db: Knex, limit: number, claimSeconds: number): Promise<DueMailRow[]> {
    const { rows } = await db.raw(`
      UPDATE mail_outbox SET status = 'sending', attempts = attempts + 1, claimed_until = now() + make_interval(secs => ?)
      WHERE id IN (
        SELECT id FROM mail_outbox
        WHERE (status = 'queued' AND next_attempt_at <= now()) OR (status = 'sending' AND claimed_until < now())
        ORDER BY id LIMIT ? FOR UPDATE SKIP LOCKED)
      RETURNING id, workshop_id, to_email, subject, text, html, attempts, message_token, attachment_name, attachment_type, attachment`, [claimSeconds, limit])
    return (rows as DueMailRow[]).sort((a, b) => a.id - b.id)
  },
  markSent(db: Knex, id: number) {
    return db('mail_outbox').where({ id, status: 'sending' }).update({ status: 'sent', sent_at: db.fn.now(), claimed_until: null, last_error: null })
  },
  /** A failed attempt: queued again after `retrySeconds`, or failed for good when `final`. */
  markFailed(db: Knex, id: number, final: boolean, error: string, retrySeconds: number) {
    return db('mail_outbox').where({ id, status: 'sending' }).update({
      claimed_until: null,
      status: final ? 'failed' : 'queued',
      last_error: error,
      next_attempt_at: db.raw(`now() + make_interval(secs => ?)`, [retrySeconds]),
    })
  },
  /** Mail not sent yet (queued or being sent): how many, and how old the oldest is, in seconds. */
  async backlog(db: Knex): Promise<{ count: number; oldestSeconds: number | null }> {
    const row = await db('mail_outbox').whereIn('status', ['queued', 'sending'])
      .first(db.raw('count(*)::int AS count'), db.raw('extract(epoch from now() - min(created_at))::float8 AS oldest'))
    return { count: Number(row?.count ?? 0), oldestSeconds: row?.oldest == null ? null : Math.round(Number(row.oldest)) }
  },
  /** Sent mail older than `days`, and mail failed for good as long ago: its use is over. */
  deleteOld(db: Knex, days: number): Promise<number> {
    return db('mail_outbox')
      .where(q => q.where('status', 'sent').where('sent_at', '<', db.raw(`now() - make_interval(days => ?)`, [days])))
      .orWhere(q => q.where('status', 'failed').where('created_at', '<', db.raw(`now() - make_interval(days => ?)`, [days])))
      .delete()
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
