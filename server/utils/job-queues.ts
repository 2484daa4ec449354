// The background queues, named once for the app's workers (server/utils/jobs.ts) and for the
// migration step that creates them (db/local/job-queue.ts): pg-boss 10 gives each new queue a
// table of its own, so creating one is DDL and belongs to `npm run db:migrate`; the app's own
// createQueue then finds the queue and changes nothing.
export const JOB_NAMES = ['mail-now', 'mail-sweep', 'overdue-check', 'cleanup'] as const
export type JobName = typeof JOB_NAMES[number]

/** "stately": at most one job waiting and one running per queue (pg-boss 10's queue policies). */
export const queueOptions = (name: JobName) => ({ name, policy: 'stately' as const })
