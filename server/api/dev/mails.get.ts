// Mail captured by the local SMTP fake (lead; only when MAIL_FAKE=1). Development aid:
// it shows every message this process's fake received, newest first.
export default defineEventHandler(async (event) => {
  await requireRole(event, 'lead')
  const fake = currentSmtpFake()
  if (!fake) throw createError({ statusCode: 404, message: 'The SMTP fake is not running in this server (MAIL_FAKE=0)' })
  return [...fake.messages].reverse()
})
