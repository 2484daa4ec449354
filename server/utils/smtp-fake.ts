// A local SMTP fake (smtp-server + mailparser) that keeps what it receives in memory, for
// the demo and the tests. It can be told to refuse the next N messages, to prove that the
// mail outbox retries after a mail-server outage.
import { SMTPServer } from 'smtp-server'
import { simpleParser } from 'mailparser'

export interface CapturedMail {
  id: number
  from: string
  to: string[]
  subject: string
  text: string
  html: string | null
  receivedAt: string
}

export interface SmtpFake {
  port: number
  messages: CapturedMail[]
  refuseNext(count: number): void
  close(): Promise<void>
}

const KEEP = 500

export async function startSmtpFake(port: number, host = '127.0.0.1'): Promise<SmtpFake> {
  const messages: CapturedMail[] = []
  let refuse = 0
  let nextId = 1
  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ['STARTTLS'],
    logger: false,
    onData(stream, session, callback) {
      const chunks: Buffer[] = []
      stream.on('data', (c: Buffer) => chunks.push(c))
      stream.on('end', async () => {
        if (refuse > 0) {
          refuse--
          const err = new Error('Mailbox temporarily unavailable (fake refusal)') as Error & { responseCode: number }
          err.responseCode = 451
          return callback(err)
        }
        const parsed = await simpleParser(Buffer.concat(chunks))
        messages.push({
          id: nextId++,
          from: session.envelope.mailFrom ? session.envelope.mailFrom.address : '',
          to: session.envelope.rcptTo.map(r => r.address),
          subject: parsed.subject ?? '',
          text: parsed.text ?? '',
          html: typeof parsed.html === 'string' ? parsed.html : null,
          receivedAt: new Date().toISOString(),
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
    refuseNext(count) { refuse = count },
    close: () => new Promise(resolve => server.close(() => resolve())),
  }
}

let current: SmtpFake | undefined
/** The fake this process started (MAIL_FAKE=1), if any. */
export function currentSmtpFake() {
  return current
}
export function setCurrentSmtpFake(fake: SmtpFake | undefined) {
  current = fake
}
