// Mail captured by the local SMTP fake (lead; only when MAIL_FAKE=1). Development aid: the
// lead's own workshop's messages, newest first (reset and invitation links open accounts, so
// no other workshop's mail, and none without a workshop, is ever shown), each with its
// attachments (name, media type, size and the bytes as base64: an invoice's PDF).
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  const fake = currentSmtpFake()
  if (!fake) throw createError({ statusCode: 404, message: 'The SMTP fake is not running in this server (MAIL_FAKE=0)' })
  return fake.messagesFor(actor.workshopId)
})
