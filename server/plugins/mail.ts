// Starts the in-process SMTP fake when MAIL_FAKE=1, the outbox worker and the overdue-demould check.
import { notifyOverdueDemoulds } from '../services/notify'

export default defineNitroPlugin(async (nitro) => {
  const env = appEnv()
  if (env.MAIL_FAKE) {
    const fake = await startSmtpFake(env.SMTP_PORT, env.SMTP_HOST)
    setCurrentSmtpFake(fake)
    console.log(`setline: SMTP fake listening on ${env.SMTP_HOST}:${fake.port} (captured mail: /lead/mails)`)
  }
  const timer = setInterval(() => {
    deliverDueMail().catch(err => console.error('mail worker:', err instanceof Error ? err.message : err))
  }, env.MAIL_WORKER_INTERVAL_MS)
  timer.unref()
  // the overdue-demould check has its own, slower clock: it scans pours, the outbox does not
  const overdue = setInterval(() => {
    notifyOverdueDemoulds(useDb()).catch(err => console.error('overdue check:', err instanceof Error ? err.message : err))
  }, env.OVERDUE_CHECK_INTERVAL_MS)
  overdue.unref()
  nitro.hooks.hook('close', async () => {
    clearInterval(timer)
    clearInterval(overdue)
    await currentSmtpFake()?.close()
    setCurrentSmtpFake(undefined)
    await closeDb()
  })
})
