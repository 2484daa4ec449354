// Makes the in-process SMTP fake refuse its next `count` messages (lead; only when MAIL_FAKE=1),
// so tests and demos can watch the outbox retry. 404 when the fake is off.
export default defineEventHandler(async (event) => {
  await requireRole(event, 'lead')
  const fake = currentSmtpFake()
  if (!fake) throw createError({ statusCode: 404, message: 'The SMTP fake is not running in this server (MAIL_FAKE=0)' })
  const { count } = await validBody(event, devMailRefuseSchema)
  fake.refuseNext(count)
  return { refusing: count }
})
