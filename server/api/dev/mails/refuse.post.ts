// Makes the in-process SMTP fake refuse its next `count` messages (lead; only when MAIL_FAKE=1),
// so tests and demos can watch the outbox retry. 404 when the fake is off.
import { z } from 'zod'

const refuseSchema = z.object({
  count: z.number({ error: 'count must be a whole number from 0 to 100' }).int({ error: 'count must be a whole number from 0 to 100' })
    .min(0, { error: 'count must be a whole number from 0 to 100' }).max(100, { error: 'count must be a whole number from 0 to 100' }),
})

export default defineEventHandler(async (event) => {
  await requireRole(event, 'lead')
  const fake = currentSmtpFake()
  if (!fake) throw createError({ statusCode: 404, message: 'The SMTP fake is not running in this server (MAIL_FAKE=0)' })
  const { count } = await validBody(event, refuseSchema)
  fake.refuseNext(count)
  return { refusing: count }
})
