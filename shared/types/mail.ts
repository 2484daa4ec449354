// GET /api/dev/mails: one message the local SMTP fake captured (development aid).
export interface CapturedMail {
  id: number
  workshopId: number | null
  from: string
  to: string[]
  subject: string
  text: string
  html: string | null
  /** the Message-ID the outbox gave the mail, the same on a resend (server/utils/mail.ts) */
  messageId: string | null
  receivedAt: string
}
