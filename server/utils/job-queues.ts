// The background queues, named once for the app's workers (server/utils/jobs.ts) and for the
// migration step that creates them (db/local/job-queue.ts): pg-boss 10 gives each new queue a
// table of its own, so creating one is DDL and belongs to `npm run db:migrate`; the app's own
// createQueue then finds the queue and changes nothing.
export const JOB_NAMES = ['mail-now', 'mail-sweep', 'overdue-check', 'cleanup'] as const
export type JobName = typeof JOB_NAMES[number]

/**
 * pg-boss 10's queue policies. Every queue holds at most one job waiting, so a burst of asks
 * coalesces into one run. The mail queues are "short": any number may run at once, since the
 * outbox's own claims keep two runs from sending one mail (server/utils/mail.ts). A "stately"
 * queue (one running at most) would stay blocked after an instance died mid-run, until pg-boss
 * expired that run (up to its expiry plus a maintenance interval, about four minutes), and no
 * instance would send mail or take back the dead one's claims meanwhile. The overdue check and
 * the clean-up are "stately": one at a time, and a late run after a crash costs little.
 */
export const queueOptions = (name: JobName) => ({ name, policy: name.startsWith('mail') ? 'short' as const : 'stately' as const })
