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
  /** the files sent with it (an invoice's PDF), bytes as base64: a development aid, like the whole message */
  attachments: CapturedAttachment[]
}

export interface CapturedAttachment {
  name: string
  type: string
  size: number
  base64: string
}
