// Starts the in-process SMTP fake when MAIL_FAKE=1, and this instance's worker of the background
// queue (server/utils/jobs.ts): mail sending and retries, the overdue-demould check and the
// nightly clean-up, each run once across all instances.
import { notifyOverdueDemoulds } from '../services/notify'
import { cleanUpOldRows } from '../services/cleanup'

export default defineNitroPlugin(async (nitro) => {
  const env = appEnv()
  const log = useLogger()
  if (env.MAIL_FAKE) {
    const fake = await startSmtpFake(env.SMTP_PORT, env.SMTP_HOST)
    setCurrentSmtpFake(fake)
    log.info(`SMTP fake listening on ${env.SMTP_HOST}:${fake.port} (captured mail: /lead/mails)`)
  }
  let stopped = false
  const handlers: JobHandlers = {
    'mail-now': deliverDueMail,
    'mail-sweep': deliverDueMail,
    'overdue-check': async () => (await notifyOverdueDemoulds(useDb())) ?? 0,
    'cleanup': async () => {
      const r = await cleanUpOldRows()
      return r.mail + r.actions + r.limits
    },
  }
  // the database may be away at boot: pages answer 503 meanwhile, and the queue starts once it is back
  const starting = (async () => {
    for (let wait = 1000; !stopped; wait = Math.min(wait * 2, 30_000)) {
      try {
        const work = await startBackgroundWork(env.DATABASE_URL, handlers)
        if (stopped) return await work.stop()
        return setBackgroundWork(work)
      }
      catch (err) {
        log.error({ err: { message: err instanceof Error ? err.message : String(err) } }, `background work did not start; trying again in ${wait / 1000} s`)
        await new Promise(r => setTimeout(r, wait).unref())
      }
    }
  })()
  nitro.hooks.hook('close', async () => {
    stopped = true
    await starting
    await currentBackgroundWork()?.stop()
    setBackgroundWork(undefined)
    await currentSmtpFake()?.close()
    setCurrentSmtpFake(undefined)
    await closeDb()
  })
})
