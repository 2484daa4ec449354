// Makes the in-process SMTP fake refuse the lead's workshop's next `count` messages (lead; only
// when MAIL_FAKE=1), so tests and demos can watch the outbox retry; other workshops' mail is
// not touched. 404 when the fake is off.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  const fake = currentSmtpFake()
  if (!fake) throw createError({ statusCode: 404, message: 'The SMTP fake is not running in this server (MAIL_FAKE=0)' })
  const { count } = await validBody(event, devMailRefuseSchema)
  fake.refuseNext(actor.workshopId, count)
  return { refusing: count }
})
