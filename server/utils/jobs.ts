// Background work in PostgreSQL, through pg-boss (its tables live in the database's `pgboss`
// schema, which `npm run db:migrate` installs and upgrades: db/local/job-queue.ts; the app
// starts pg-boss with migrate off, so it needs no DDL rights and refuses an old schema). Every app instance runs a worker; the queues make
// each piece of work run once across all of them:
// - mail-now: asked for when a transaction that queued mail commits (server/utils/mail.ts);
// - mail-sweep, every MAIL_WORKER_INTERVAL_MS: retries that came due, and mail claimed by an
//   instance that died;
// - overdue-check, every OVERDUE_CHECK_INTERVAL_MS: pours past their demould window or missed start;
// - cleanup, nightly at 03:40 server time: rows whose use is over (server/services/cleanup.ts).
// Each queue holds at most one job waiting (server/utils/job-queues.ts), so a burst of requests
// coalesces into one run; the mail queues may run on several instances at once. The repeating
// ones put their next run in the queue as they start, with startAfter, rather than keeping a
// timer in every process; pg-boss's cron has a one-minute grain, which the nightly clean-up
// uses. Each run is recorded in background_runs for the readiness route (GET /api/ready).
import PgBoss from 'pg-boss'
import { backgroundRunsRepo } from '../repos/background-runs'
import { JOB_NAMES, queueOptions, type JobName } from './job-queues'

export type JobHandlers = Record<JobName, () => Promise<number>>

export interface BackgroundWork {
  boss: PgBoss
  /** Puts a run of `name` in the queue (absorbed when one is already waiting). */
  send(name: JobName, startAfter?: Date): Promise<string | null>
  stop(): Promise<void>
}

/** Repeating jobs and how far apart their runs are. */
function repeats(): Partial<Record<JobName, number>> {
  const env = appEnv()
  return { 'mail-sweep': env.MAIL_WORKER_INTERVAL_MS, 'overdue-check': env.OVERDUE_CHECK_INTERVAL_MS }
}

/**
 * Starts a pg-boss worker on `connectionString` running `handlers`. Several may run against one
 * database (one per app instance; tests start two in one process).
 */
export async function startBackgroundWork(connectionString: string, handlers: JobHandlers): Promise<BackgroundWork> {
  const log = useLogger()
  const boss = new PgBoss({
    connectionString,
    max: 3,
    application_name: 'setline-jobs',
    // the schema is the migration step's (db/local/job-queue.ts): only pg-boss's version check here
    migrate: false,
    // finished jobs are kept a day for looking into, then pg-boss deletes them
    deleteAfterDays: 1,
  })
  boss.on('error', err => log.error({ err: { message: err.message } }, 'job queue'))
  try {
    await boss.start()
  }
  catch (err) {
    // pg-boss's own check: its schema is missing or older than this pg-boss (the pool it opened is closed)
    await boss.stop({ graceful: false }).catch(() => {})
    const message = err instanceof Error ? err.message : String(err)
    throw new Error(`the job queue is not ready (${message}): run \`npm run db:migrate\``)
  }
  const every = repeats()
  /**
   * Repeating jobs whose next run could not be queued (the database was away when a run put in
   * its successor): the chain would end there, and with it the mail sweep's retries, until the
   * process restarted. Their worker queues a run again once the database answers.
   */
  const unchained = new Set<JobName>()
  const send = (name: JobName, startAfter?: Date) =>
    boss.send(name, {}, { startAfter, retryLimit: 0, expireInSeconds: name === 'cleanup' ? 15 * 60 : 120 }).then((id) => {
      unchained.delete(name)
      return id
    }, (err: Error) => {
      log.error({ job: name, err: { message: err.message } }, 'job not queued')
      if (every[name]) unchained.add(name)
      return null
    })
  /** One run of a job, every step caught: a failed run is logged and recorded, never thrown. */
  async function runOnce(name: JobName) {
    const gap = every[name]
    if (gap) await send(name, new Date(Date.now() + gap))
    const db = useDb()
    try {
      await backgroundRunsRepo.started(db, name)
      const items = await handlers[name]()
      await backgroundRunsRepo.finished(db, name, true, items)
      if (items) log.info({ job: name, items }, 'background run')
    }
    catch (err) {
      await backgroundRunsRepo.finished(db, name, false, 0).catch(() => {})
      log.error({ job: name, err: { message: err instanceof Error ? err.message : String(err) } }, 'background run failed')
    }
  }
  let stopped = false
  let wake: (() => void) | undefined
  const pause = (ms: number) => new Promise<void>((resolve) => {
    const timer = setTimeout(resolve, ms)
    wake = () => {
      clearTimeout(timer)
      resolve()
    }
  })
  /**
   * One queue's worker: fetch a job, run it, mark it done, each step awaited and caught. pg-boss
   * 10's own work() leaves its complete and fail calls unawaited, so a database that goes away
   * during a run surfaced as an unhandled rejection; here it is logged, and the completion is
   * tried again for a few seconds (after that the job runs out at its expiry and runs again).
   */
  async function worker(name: JobName, pollMs: number) {
    while (!stopped) {
      if (unchained.has(name)) await send(name)
      let job: { id: string } | undefined
      try {
        [job] = await boss.fetch(name)
      }
      catch (err) {
        log.error({ job: name, err: { message: err instanceof Error ? err.message : String(err) } }, 'job queue')
      }
      if (!job) {
        await pause(pollMs)
        continue
      }
      await runOnce(name)
      for (let attempt = 0; attempt < 10 && !stopped; attempt++) {
        try {
          await boss.complete(name, job.id)
          break
        }
        catch (err) {
          if (attempt === 0) log.error({ job: name, err: { message: err instanceof Error ? err.message : String(err) } }, 'job queue: completion not recorded yet')
          await pause(1000)
        }
      }
    }
  }
  const workers: Promise<void>[] = []
  for (const name of JOB_NAMES) {
    await boss.createQueue(name, queueOptions(name))
    workers.push(worker(name, name.startsWith('mail') ? 500 : 2000))
  }
  // the first run of each repeating job; absorbed when an instance already queued one
  for (const name of Object.keys(every) as JobName[]) await send(name)
  await boss.schedule('cleanup', '40 3 * * *', {}, { tz: Intl.DateTimeFormat().resolvedOptions().timeZone })
  return {
    boss,
    send,
    async stop() {
      stopped = true
      wake?.()
      await Promise.race([Promise.all(workers), new Promise(resolve => setTimeout(resolve, 5000))])
      await boss.stop({ graceful: true, timeout: 5000, wait: true })
    },
  }
}

let current: BackgroundWork | undefined
let pendingKick = false

/** This process's background work, once the plugin started it (server/plugins/jobs.ts). */
export function setBackgroundWork(work: BackgroundWork | undefined) {
  current = work
  if (work && pendingKick) {
    pendingKick = false
    void work.send('mail-now')
  }
}

export function currentBackgroundWork() {
  return current
}

/** Asks the queue to send mail now (after the transaction that queued it committed). */
export function kickMailDelivery() {
  if (current) void current.send('mail-now')
  else pendingKick = true
}
