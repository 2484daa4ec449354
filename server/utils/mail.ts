// Mail goes through the mail_outbox table: a route queues in its own transaction, and the
// worker (server/plugins/mail-worker.ts) sends with retries, so an SMTP outage loses nothing.
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
}

let transport: Transporter | undefined
function mailer() {
  if (!transport) {
    const env = appEnv()
    transport = nodemailer.createTransport({
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
  })
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

let running: Promise<number> | undefined

/** Sends what is due; one run at a time per process, rows locked so instances share the work. */
export function deliverDueMail(): Promise<number> {
  running ??= sendBatch().finally(() => {
    running = undefined
  })
  return running
}

async function sendBatch(): Promise<number> {
  const db = useDb()
  let sent = 0
  await db.transaction(async (trx) => {
    const due = await mailOutboxRepo.due(trx, 20)
    for (const m of due) {
      try {
        await mailer().sendMail({
          from: appEnv().MAIL_FROM, to: m.to_email, subject: m.subject, text: m.text, html: m.html ?? undefined,
          // whose mail this is, for the SMTP fake's per-workshop view (server/utils/smtp-fake.ts)
          headers: m.workshop_id == null ? {} : { [MAIL_WORKSHOP_HEADER]: String(m.workshop_id) },
        })
        await mailOutboxRepo.markSent(trx, m.id, m.attempts + 1)
        sent++
      }
      catch (err) {
        const attempts = m.attempts + 1
        await mailOutboxRepo.markFailed(trx, m.id, attempts, attempts >= MAX_ATTEMPTS,
          String(err instanceof Error ? err.message : err).slice(0, 500), retryDelaySeconds(attempts))
      }
    }
  })
  return sent
}
