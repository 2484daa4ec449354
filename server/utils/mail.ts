// Mail goes through the mail_outbox table: a route queues in its own transaction, and the
// background queue (server/utils/jobs.ts) sends with retries, so an SMTP outage loses nothing.
// A queued mail asks the queue to send as soon as its transaction commits.
import nodemailer, { type Transporter } from 'nodemailer'
import type { Knex } from 'knex'
import { mailOutboxRepo } from '../repos/mail-outbox'

export interface OutgoingMail {
  workshopId: number | null
  userId?: number | null
  to: string
  kind: string
  subject: string
  text: string
  dedupeKey?: string
  /** one file sent with the mail (an invoice's PDF), kept in the outbox so a retry sends the same bytes */
  attachment?: { name: string; type: string; content: Buffer }
}

let transport: Transporter | undefined
function mailer() {
  if (!transport) {
    const env = appEnv()
    // SMTP_URL carries the relay whole (user and password included); else the separate settings
    if (env.SMTP_URL) transport = nodemailer.createTransport(env.SMTP_URL)
    else transport = nodemailer.createTransport({
      host: env.SMTP_HOST,
      port: env.SMTP_PORT,
      secure: env.SMTP_SECURE,
      auth: env.SMTP_USER ? { user: env.SMTP_USER, pass: env.SMTP_PASS ?? '' } : undefined,
      // the local fake speaks plain SMTP; a real relay negotiates TLS itself
      ignoreTLS: env.MAIL_FAKE,
    })
  }
  return transport
}

export async function queueMail(db: Knex, mail: OutgoingMail) {
  await mailOutboxRepo.insert(db, {
    workshop_id: mail.workshopId,
    user_id: mail.userId ?? null,
    to_email: mail.to,
    kind: mail.kind,
    subject: mail.subject,
    text: mail.text,
    dedupe_key: mail.dedupeKey ?? null,
    attachment_name: mail.attachment?.name ?? null,
    attachment_type: mail.attachment?.type ?? null,
    attachment: mail.attachment?.content ?? null,
  })
  afterCommit(db, kickMailDelivery)
}

/** Runs `fn` once `db`'s transaction has committed (at once outside one); nothing on rollback. */
function afterCommit(db: Knex, fn: () => void) {
  const trx = db as Knex & { isTransaction?: boolean; executionPromise?: Promise<unknown> }
  if (trx.isTransaction && trx.executionPromise) trx.executionPromise.then(fn, () => {})
  else fn()
}

const MAX_ATTEMPTS = 8

/**
 * Backoff after the n-th failed attempt: base·n² seconds (with the default base of 15 s:
 * 15 s, 1 min, 2¼ min, …) capped at one hour. Quadratic backoff is common practice for
 * outboxes; the base is MAIL_RETRY_BASE_SECONDS so tests can retry within a second.
 */
export function retryDelaySeconds(attempts: number, baseSeconds = appEnv().MAIL_RETRY_BASE_SECONDS) {
  return Math.min(3600, baseSeconds * attempts * attempts)
}

/**
 * A claimed mail stays with the process that claimed it for MAIL_CLAIM_SECONDS (default ten
 * minutes; sending a batch takes seconds). A process that dies mid-send leaves its claims to run
 * out, and the mail is claimed again: sending is at least once, and a relay that took a mail just
 * before the crash sees it twice. Both copies carry the row's own Message-ID (messageId below),
 * so mail stores and clients show them as one message.
 */
const BATCH = 20

/** The row's Message-ID, the same on every attempt (RFC 5322 §3.6.4), in the sender's domain. */
export function messageId(token: string, from = appEnv().MAIL_FROM) {
  const domain = /@([^>\s]+)>?\s*$/.exec(from)?.[1] ?? 'setline.invalid'
  return `<${token}@${domain}>`
}

let running: Promise<number> | undefined

/** Sends what is due; one run at a time per process (the queue runs it, server/utils/jobs.ts). */
export function deliverDueMail(): Promise<number> {
  running ??= deliverMailBatch().finally(() => {
    running = undefined
  })
  return running
}

/**
 * One batch: claim up to BATCH due mails in one short statement (committed before anything
 * is sent, so no row lock is held while the relay is talked to), then send each and record
 * its outcome. Two processes claiming at once get different mails (SKIP LOCKED), so each
 * mail is sent once.
 */
export async function deliverMailBatch(db: Knex = useDb()): Promise<number> {
  let sent = 0
  const claimed = await mailOutboxRepo.claimDue(db, BATCH, appEnv().MAIL_CLAIM_SECONDS)
  for (const m of claimed) {
    try {
      await mailer().sendMail({
        from: appEnv().MAIL_FROM, to: m.to_email, subject: m.subject, text: m.text, html: m.html ?? undefined,
        messageId: messageId(m.message_token),
        attachments: m.attachment ? [{ filename: m.attachment_name ?? 'attachment', contentType: m.attachment_type ?? 'application/octet-stream', content: m.attachment }] : undefined,
        // whose mail this is, for the SMTP fake's per-workshop view (server/utils/smtp-fake.ts)
        headers: m.workshop_id == null ? {} : { [MAIL_WORKSHOP_HEADER]: String(m.workshop_id) },
      })
      await mailOutboxRepo.markSent(db, m.id)
      sent++
    }
    catch (err) {
      await mailOutboxRepo.markFailed(db, m.id, m.attempts >= MAX_ATTEMPTS,
        String(err instanceof Error ? err.message : err).slice(0, 500), retryDelaySeconds(m.attempts))
    }
  }
  return sent
}
