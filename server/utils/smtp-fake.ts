// A local SMTP fake (smtp-server + mailparser) that keeps what it receives in memory, for
// the demo and the tests. Reset and invitation links are keys to accounts, so every message
// is kept with the workshop its X-Setline-Workshop header names, a lead sees only their own
// workshop's messages, and a message without a workshop is shown to no one. It can be told to
// refuse a workshop's next N messages, to prove that the mail outbox retries after a
// mail-server outage, without touching any other workshop's mail.
import type { CapturedMail } from '#shared/types/mail'
import { SMTPServer } from 'smtp-server'
import { simpleParser } from 'mailparser'

/**
 * The header the outbox sender (server/utils/mail.ts) writes the message's workshop id into.
 * An `X-` name is kept for user-defined fields (RFC 822 §4.7.5; optional fields, RFC 5322 §3.6.8),
 * which mail servers pass on untouched.
 */
export const MAIL_WORKSHOP_HEADER = 'X-Setline-Workshop'

export interface SmtpFake {
  port: number
  /** Every message kept, oldest first (all workshops: for this process only, never for a route). */
  messages: CapturedMail[]
  /** A workshop's messages, newest first. */
  messagesFor(workshopId: number): CapturedMail[]
  /** Refuses the workshop's next `count` messages (0 stops refusing); other workshops' mail goes through. */
  refuseNext(workshopId: number, count: number): void
  close(): Promise<void>
}

const KEEP = 500

function workshopOf(value: unknown): number | null {
  const text = typeof value === 'string' ? value.trim() : ''
  return /^[1-9]\d{0,15}$/.test(text) ? Number(text) : null
}

export async function startSmtpFake(port: number, host = '127.0.0.1'): Promise<SmtpFake> {
  const messages: CapturedMail[] = []
  const refusing = new Map<number, number>()
  let nextId = 1
  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ['STARTTLS'],
    logger: false,
    onData(stream, session, callback) {
      const chunks: Buffer[] = []
      stream.on('data', (c: Buffer) => chunks.push(c))
      stream.on('end', async () => {
        let parsed
        try {
          parsed = await simpleParser(Buffer.concat(chunks))
        }
        catch {
          const err = new Error('Message could not be read') as Error & { responseCode: number }
          err.responseCode = 554
          return callback(err)
        }
        const workshopId = workshopOf(parsed.headers.get(MAIL_WORKSHOP_HEADER.toLowerCase()))
        const refuse = workshopId === null ? 0 : refusing.get(workshopId) ?? 0
        if (refuse > 0) {
          refusing.set(workshopId!, refuse - 1)
          const err = new Error('Mailbox temporarily unavailable (fake refusal)') as Error & { responseCode: number }
          err.responseCode = 451
          return callback(err)
        }
        messages.push({
          id: nextId++,
          workshopId,
          from: session.envelope.mailFrom ? session.envelope.mailFrom.address : '',
          to: session.envelope.rcptTo.map(r => r.address),
          subject: parsed.subject ?? '',
          text: parsed.text ?? '',
          html: typeof parsed.html === 'string' ? parsed.html : null,
          messageId: parsed.messageId ?? null,
          receivedAt: new Date().toISOString(),
          attachments: parsed.attachments.map(a => ({ name: a.filename ?? '', type: a.contentType, size: a.content.length, base64: a.content.toString('base64') })),
        })
        if (messages.length > KEEP) messages.splice(0, messages.length - KEEP)
        callback()
      })
    },
  })
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject)
    server.listen(port, host, () => resolve())
  })
  const address = server.server.address()
  return {
    port: typeof address === 'object' && address ? address.port : port,
    messages,
    messagesFor: workshopId => messages.filter(m => m.workshopId === workshopId).reverse(),
    refuseNext(workshopId, count) {
      if (count > 0) refusing.set(workshopId, count)
      else refusing.delete(workshopId)
    },
    close: () => new Promise(resolve => server.close(() => resolve())),
  }
}

/**
 * Why this start may not run the SMTP fake, or undefined when it may. The fake swallows every
 * message (no one would get their reset link) and shows leads their workshop's links, so it is
 * for the demo and the tests only. An https APP_URL or TRUST_PROXY=1 (a reverse proxy in
 * front) means people reach this server for real: then the fake needs MAIL_FAKE_EXPOSE=1, said
 * on purpose (e.g. a demo behind TLS).
 */
export function mailFakeProblem(env: { MAIL_FAKE: boolean; MAIL_FAKE_EXPOSE: boolean; APP_URL: string; TRUST_PROXY: boolean }) {
  if (!env.MAIL_FAKE || env.MAIL_FAKE_EXPOSE) return undefined
  const https = env.APP_URL.toLowerCase().startsWith('https:')
  if (!https && !env.TRUST_PROXY) return undefined
  return `MAIL_FAKE=1 keeps every e-mail inside the app, but ${https ? 'APP_URL is https' : 'TRUST_PROXY=1'}: this looks like a real deployment. `
    + 'Set SMTP_HOST (and MAIL_FAKE=0) to send mail, or MAIL_FAKE_EXPOSE=1 if this really is a demo.'
}

let current: SmtpFake | undefined
/** The fake this process started (MAIL_FAKE=1), if any. */
export function currentSmtpFake() {
  return current
}
export function setCurrentSmtpFake(fake: SmtpFake | undefined) {
  current = fake
}
