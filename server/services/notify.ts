// E-mail notifications, one function per kind, all through the mail_outbox (queueMail) inside
// the caller's transaction. Each respects the recipient's notify_prefs (a kind is on unless
// the user turned it off) and carries a dedupe key, so a retried request or a second worker
// run never mails twice. Keys end with the recipient id because a job has several members
// and a workshop several leads: the mail_outbox.dedupe_key column is unique across all rows.
// Call these inside the transaction that causes the mail, never queueMail directly. A new kind
// goes into NOTIFY_KINDS / NOTIFY_KIND_INFO (shared/utils/notify-schemas.ts); /account lists it.
// A job's client mail (samples, progress photos, ready for dispatch, deliveries, invoices) goes to the contacts of the
// job's client organisation who have that mail on (client_contacts: the lead's choice per
// contact); a contact who is also a user of the workshop keeps their own settings from /account
// on top, and a disabled user's contact gets nothing. A job without a client organisation mails
// its client members, as before clients had contacts. Contact keys end with c<contactId>.
// The job page's link goes only to those who can open it (a client member of the job); any
// other contact is told the workshop can give them access, and reads the news in the mail.
// Our decision: an invitation is the lead's to give (it opens the workshop's portal), never a
// side effect of a contact's mail setting; and a link that answers "not found" helps nobody.
import type { Knex } from 'knex'
import { notifyPrefsOf, type NotifyKind } from '#shared/utils/notify-schemas'
import { boardLocalDay } from '#shared/utils/board-rules'
import { usersRepo, type RecipientRow } from '../repos/users'
import { jobsRepo, type JobRow } from '../repos/jobs'
import { workshopsRepo } from '../repos/workshops'
import { mailOutboxRepo } from '../repos/mail-outbox'
import { clientContactsRepo, type ContactMail } from '../repos/client-contacts'
import { formatDateTime, formatDay, workshopLocale } from '#shared/utils/workshop-format'
import { MISSED_START_GRACE_MINUTES } from '#shared/utils/pour-status'
import type { OutgoingMail } from '../utils/mail'

/** A user, or a client contact (key c<contactId>; userId when the contact is also a user). */
type Recipient = RecipientRow & { key?: string; userId?: number | null; opensJob?: boolean }
type JobRef = Pick<JobRow, 'id' | 'code' | 'title'>

const link = (path: string) => `${appEnv().APP_URL}${path}`

/** Queues one mail per recipient who has `kind` on; returns how many were queued (or deduped). */
async function send(trx: Knex, workshopId: number, kind: NotifyKind, to: Recipient[], mail: (r: Recipient) => { subject: string; lines: string[]; dedupeKey: string; attachment?: OutgoingMail['attachment'] }) {
  let queued = 0
  for (const r of to) {
    if (!notifyPrefsOf(r.notify_prefs)[kind]) continue
    const m = mail(r)
    await queueMail(trx, { workshopId, userId: r.key ? (r.userId ?? null) : r.id, to: r.email, kind, subject: m.subject, text: [`Hello ${r.name},`, '', ...m.lines].join('\n'), dedupeKey: m.dedupeKey, attachment: m.attachment })
    queued++
  }
  return queued
}

const CONTACT_MAIL: Partial<Record<NotifyKind, ContactMail>> = { sample_ready: 'mail_samples', photos_shared: 'mail_progress', job_ready: 'mail_dispatch', delivery: 'mail_dispatch', invoice: 'mail_invoices' }

/** Who gets a job's client mail of `kind`: its client's contacts with that mail on, or its members when it has no client. */
async function jobClientRecipients(trx: Knex, workshopId: number, jobId: number, kind: NotifyKind): Promise<Recipient[]> {
  const orgId = await jobsRepo.clientOrgId(trx, workshopId, jobId)
  if (!orgId) return usersRepo.jobMemberRecipients(trx, workshopId, jobId)
  const contacts = await clientContactsRepo.recipients(trx, workshopId, orgId, CONTACT_MAIL[kind]!)
  const members = new Set((await jobsRepo.members(trx, workshopId, jobId)).map(m => Number(m.id)))
  return contacts.map(c => ({
    id: c.id, name: c.name, email: c.email, notify_prefs: c.notify_prefs ?? {}, key: `c${c.id}`, userId: c.user_id,
    opensJob: c.user_id !== null && c.user_role === 'client' && members.has(Number(c.user_id)),
  }))
}

/** The job page's link for whoever can open it; for a contact who cannot, how to get access instead. */
function jobPageLines(r: Recipient, jobId: number, intro: string, otherwise: string): string[] {
  if (r.opensJob !== false) return [intro, link(`/client/jobs/${jobId}`)]
  return [otherwise, 'To follow the job online, ask the workshop to invite you to its Setline.']
}
const rid = (r: Recipient) => r.key ?? String(r.id)

/** To the job's client contacts: the sample is ready for approval. `round` is the job version. */
export function notifySampleReady(trx: Knex, workshopId: number, job: JobRef & { version: number }) {
  return jobClientRecipients(trx, workshopId, job.id, 'sample_ready').then(to => send(trx, workshopId, 'sample_ready', to, r => ({
    subject: `Sample ready for your approval: ${job.code} ${job.title}`,
    lines: [`The sample cast for ${job.code} (${job.title}) is ready for your approval.`,
      ...jobPageLines(r, job.id, 'Approve it, or ask for changes with a comment, here:', 'To approve it or ask for changes, reply to the workshop.'), '',
      'The rest of the job goes on the casting board once you approve the sample.'],
    dedupeKey: `sample-ready:${job.id}:${job.version}:${rid(r)}`,
  })))
}

/**
 * To the job's client members: new shared photos. Batched by the dedupe key: the first call of
 * a workshop-local day queues the mail, later calls that day are absorbed.
 */
export async function notifyPhotosShared(trx: Knex, workshopId: number, jobId: number) {
  const job = await jobsRepo.byId(trx, workshopId, jobId)
  if (!job) return 0
  const ws = await workshopsRepo.get(trx, workshopId)
  const day = boardLocalDay(new Date(), ws?.timezone ?? 'UTC')
  return send(trx, workshopId, 'photos_shared', await jobClientRecipients(trx, workshopId, jobId, 'photos_shared'), r => ({
    subject: `New photos of ${job.code} ${job.title}`,
    lines: [`The workshop has shared new photos of ${job.code} (${job.title}).`, ...jobPageLines(r, job.id, 'See them on your job page:', 'The workshop can send you copies if you ask.')],
    dedupeKey: `photos:${job.id}:${day}:${rid(r)}`,
  }))
}

/** To the job's client contacts: the job is ready for dispatch (called when the last needed piece is ready). */
export async function notifyJobReady(trx: Knex, workshopId: number, jobId: number) {
  const job = await jobsRepo.byId(trx, workshopId, jobId)
  if (!job) return 0
  return send(trx, workshopId, 'job_ready', await jobClientRecipients(trx, workshopId, jobId, 'job_ready'), r => ({
    subject: `Ready for dispatch: ${job.code} ${job.title}`,
    lines: [`Every piece of ${job.code} (${job.title}) is ready for dispatch.`, ...jobPageLines(r, job.id, 'The workshop will be in touch about delivery. Your job page:', 'The workshop will be in touch about delivery.')],
    dedupeKey: `job-ready:${job.id}:${rid(r)}`,
  }))
}

/** To the job's client contacts with dispatch mail on: a delivery is booked (day, vehicle, what goes). */
export async function notifyDeliveryBooked(trx: Knex, workshopId: number, d: { id: number; jobId: number; day: string; vehicle: string; pieces: number; crates: number; site: string | null }) {
  const job = await jobsRepo.byId(trx, workshopId, d.jobId)
  if (!job) return 0
  const locale = workshopLocale((await workshopsRepo.get(trx, workshopId))?.locale)
  const day = formatDay(`${d.day}T12:00:00Z`, 'UTC', locale)
  return send(trx, workshopId, 'delivery', await jobClientRecipients(trx, workshopId, d.jobId, 'delivery'), r => ({
    subject: `Delivery booked for ${day}: ${job.code} ${job.title}`,
    lines: [`A delivery of ${job.code} (${job.title}) is booked for ${day}${d.site ? ` to ${d.site}` : ''}.`,
      `It carries ${d.pieces} piece${d.pieces === 1 ? '' : 's'}${d.crates ? ` in ${d.crates} crate${d.crates === 1 ? '' : 's'}` : ''} on ${d.vehicle}.`,
      'Someone on site will be asked to sign for it. Follow it on your job page:', link(`/client/jobs/${job.id}`)],
    dedupeKey: `delivery-booked:${d.id}:${rid(r)}`,
  }))
}

/** To the job's client contacts with dispatch mail on: the delivery was signed for; the signed note is in the portal. */
export async function notifyDeliverySigned(trx: Knex, workshopId: number, d: { id: number; jobId: number; receiverName: string; broken: string[] }) {
  const job = await jobsRepo.byId(trx, workshopId, d.jobId)
  if (!job) return 0
  return send(trx, workshopId, 'delivery', await jobClientRecipients(trx, workshopId, d.jobId, 'delivery'), r => ({
    subject: `Delivered and signed for: ${job.code} ${job.title}`,
    lines: [`The delivery of ${job.code} (${job.title}) was signed for by ${d.receiverName}.`,
      ...(d.broken.length ? [`Noted broken on arrival: ${d.broken.join(', ')}. The workshop will cast replacements.`] : []),
      'The signed delivery note (PDF):', link(`/api/client/deliveries/${d.id}/note`), 'Your job page:', link(`/client/jobs/${job.id}`)],
    dedupeKey: `delivery-signed:${d.id}:${rid(r)}`,
  }))
}

/**
 * To the job's client contacts with invoice mail on: an invoice was issued, its PDF attached (the
 * bytes made once, when it is issued, and kept in the outbox: a retry sends the same document).
 * One mail per invoice and contact (key invoice:<invoiceId>:<recipient>); a void sends nothing.
 */
export async function notifyInvoiceIssued(trx: Knex, workshopId: number, inv: { id: number; number: string; jobId: number; what: string; total: string; amountDue: string; pdf: { filename: string; pdf: Buffer } }) {
  const job = await jobsRepo.byId(trx, workshopId, inv.jobId)
  if (!job) return 0
  return send(trx, workshopId, 'invoice', await jobClientRecipients(trx, workshopId, inv.jobId, 'invoice'), r => ({
    subject: `Invoice ${inv.number}: ${job.code} ${job.title}`,
    lines: [`Our invoice ${inv.number} for ${job.code} (${job.title}), ${inv.what}, comes to ${inv.total} with tax; ${inv.amountDue} is due.`,
      `The invoice is attached as a PDF (${inv.pdf.filename}).`,
      ...jobPageLines(r, job.id, 'You can also download it from your job page:', 'Please reply to the workshop with any question about it.')],
    dedupeKey: `invoice:${inv.id}:${rid(r)}`,
    attachment: { name: inv.pdf.filename, type: 'application/pdf', content: inv.pdf.pdf },
  }))
}

/** To the leads: a client approved the sample or asked for changes. `decisionId` makes each decision one mail. */
export async function notifySampleDecision(trx: Knex, workshopId: number, input: { job: JobRef; clientName: string; decision: 'approved' | 'changes_requested'; comment: string | null; decidedAt: Date }) {
  const { job, clientName, decision, comment } = input
  const verdict = decision === 'approved' ? 'approved the sample' : 'asked for changes to the sample'
  return send(trx, workshopId, 'sample_decision', await usersRepo.leadRecipients(trx, workshopId), r => ({
    subject: `${job.code}: ${clientName} ${verdict}`,
    lines: [`${clientName} ${verdict} for ${job.code} (${job.title}).`,
      comment ? `Their comment: ${comment}` : 'They left no comment.', '', link(`/lead/jobs/${job.id}`)],
    dedupeKey: `sample-decision:${job.id}:${input.decidedAt.getTime()}:${r.id}`,
  }))
}

/** To the client organisation's people: a quote revision waits for their decision. */
export async function notifyQuoteSent(trx: Knex, workshopId: number, q: { id: number; number: string; title: string; revision: number; total: string; clientOrgId: number }) {
  return send(trx, workshopId, 'quote_sent', await usersRepo.orgRecipients(trx, workshopId, q.clientOrgId), r => ({
    subject: `Quote ${q.number}: ${q.title}`,
    lines: [`Our quote ${q.number} (${q.title}), revision ${q.revision}, comes to ${q.total} with tax.`,
      'Read it, download the PDF, and accept it or ask for changes here:', link(`/client/quotes/${q.id}`)],
    dedupeKey: `quote-sent:${q.id}:${q.revision}:${r.id}`,
  }))
}

/** To the leads: a client accepted a quote revision or asked for changes. */
export async function notifyQuoteDecision(trx: Knex, workshopId: number, q: { id: number; number: string; revision: number; clientName: string; accepted: boolean; comment: string | null }) {
  const verdict = q.accepted ? 'accepted' : 'asked for changes to'
  return send(trx, workshopId, 'quote_decision', await usersRepo.leadRecipients(trx, workshopId), r => ({
    subject: `${q.number}: ${q.clientName} ${verdict} revision ${q.revision}`,
    lines: [`${q.clientName} ${verdict} quote ${q.number}, revision ${q.revision}.`,
      q.comment ? `Their comment: ${q.comment}` : 'They left no comment.', '', link(`/lead/quotes/${q.id}`)],
    dedupeKey: `quote-decision:${q.id}:${q.revision}:${r.id}`,
  }))
}

/**
 * Only windows that closed in the last two days: a pour forgotten for longer is old news (the
 * board shows it), and the bound keeps a first run on an old database from mailing its history
 * and keeps pours whose leads turned the kind off from filling every batch.
 */
const OVERDUE_LOOKBACK_MS = 2 * 86_400_000

/**
 * The periodic check, in the words of pourSituation (shared/utils/pour-status.ts): an overdue
 * demould (mixing or setting, window closed: a cast left past its window can crack or stick in
 * the mould) and a missed start (still planned past its mix time and grace: nothing was cast,
 * the pour needs re-planning) are mailed apart, once per pour and lead (dedupe keys
 * overdue:pourId:leadId and missed:pourId:leadId), both under the lead's overdue preference.
 */
export async function notifyOverdueDemoulds(db: Knex, now = new Date()) {
  const late = await mailOutboxRepo.latePoursUnmailed(db, now, new Date(now.getTime() - OVERDUE_LOOKBACK_MS), MISSED_START_GRACE_MINUTES * 60_000, 200)
  let queued = 0
  for (const p of late) {
    const job = p.job_code ? ` (${p.job_code})` : ''
    const forJob = p.job_code ? ` for ${p.job_code}` : ''
    const missed = p.state === 'planned'
    await db.transaction(async (trx) => {
      queued += await send(trx, p.workshop_id, 'demould_overdue', await usersRepo.leadRecipients(trx, p.workshop_id), r => (missed
        ? {
            subject: `Missed start: mould ${p.code}${job}`,
            lines: [`The pour on mould ${p.code}${forJob} was never mixed: it was due at ${formatDateTime(new Date(p.mix_at), p.timezone, workshopLocale(p.locale))}. Nothing is in the mould.`,
              'Re-plan or void it on the pour board:', link('/lead/board')],
            dedupeKey: `missed:${p.id}:${r.id}`,
          }
        : {
            subject: `Overdue demould: mould ${p.code}${job}`,
            lines: [`The cast on mould ${p.code}${forJob} is still in the mould, and its demould window closed at ${formatDateTime(new Date(p.demould_close_at), p.timezone, workshopLocale(p.locale))}.`,
              'Check the cast on the pour board:', link('/lead/board')],
            dedupeKey: `overdue:${p.id}:${r.id}`,
          }))
    })
  }
  return queued
}
