// The SMTP fake keeps each message with its workshop (the X-Setline-Workshop header), shows a
// workshop only its own messages, and refuses per workshop; and it may not run on a start
// that serves real users unless that is said on purpose.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import nodemailer from 'nodemailer'
import { MAIL_WORKSHOP_HEADER, mailFakeProblem, startSmtpFake, type SmtpFake } from '../../server/utils/smtp-fake'

let fake: SmtpFake
beforeAll(async () => {
  fake = await startSmtpFake(0)
})
afterAll(() => fake.close())

function send(subject: string, workshop?: number) {
  const transport = nodemailer.createTransport({ host: '127.0.0.1', port: fake.port, secure: false, ignoreTLS: true })
  return transport.sendMail({
    from: 'a@example.test', to: 'b@example.test', subject, text: 'x',
    headers: workshop === undefined ? {} : { [MAIL_WORKSHOP_HEADER]: String(workshop) },
  })
}

describe('SMTP fake', () => {
  it('shows a workshop only its own mail, newest first, and mail without a workshop to none', async () => {
    await send('one for 1', 1)
    await send('one for 2', 2)
    await send('another for 1', 1)
    await send('for no one')
    expect(fake.messagesFor(1).map(m => m.subject)).toEqual(['another for 1', 'one for 1'])
    expect(fake.messagesFor(2).map(m => m.subject)).toEqual(['one for 2'])
    expect(fake.messages.find(m => m.subject === 'for no one')?.workshopId).toBeNull()
  })

  it('keeps an attachment\'s name, media type and bytes', async () => {
    const transport = nodemailer.createTransport({ host: '127.0.0.1', port: fake.port, secure: false, ignoreTLS: true })
    const bytes = Buffer.from([0x25, 0x50, 0x44, 0x46, 0x2d, 0x00, 0xff, 0x0a]) // "%PDF-", a NUL, a high byte
    await transport.sendMail({
      from: 'a@example.test', to: 'b@example.test', subject: 'with a file', text: 'x', headers: { [MAIL_WORKSHOP_HEADER]: '3' },
      attachments: [{ filename: 'INV-0001.pdf', contentType: 'application/pdf', content: bytes }],
    })
    const [m] = fake.messagesFor(3)
    expect(m!.attachments.map(a => ({ ...a, bytes: Buffer.from(a.base64, 'base64') }))).toEqual([
      { name: 'INV-0001.pdf', type: 'application/pdf', size: 8, base64: bytes.toString('base64'), bytes },
    ])
    await send('no file', 3)
    expect(fake.messagesFor(3)[0]!.attachments).toEqual([])
  })

  it('refuses only the named workshop\'s next messages', async () => {
    fake.refuseNext(1, 1)
    await send('2 goes through', 2)
    await expect(send('1 is refused', 1)).rejects.toMatchObject({ responseCode: 451 })
    await send('1 goes through now', 1)
    expect(fake.messagesFor(2)[0]!.subject).toBe('2 goes through')
    expect(fake.messagesFor(1)[0]!.subject).toBe('1 goes through now')
    expect(fake.messages.some(m => m.subject === '1 is refused')).toBe(false)
  })
})

describe('mailFakeProblem', () => {
  const base = { MAIL_FAKE: true, MAIL_FAKE_EXPOSE: false, APP_URL: 'http://127.0.0.1:3000', TRUST_PROXY: false }
  it('lets the demo and the tests run the fake on plain http without a proxy', () => {
    expect(mailFakeProblem(base)).toBeUndefined()
    expect(mailFakeProblem({ ...base, APP_URL: 'http://192.168.1.20:3000' })).toBeUndefined()
  })
  it('refuses it on an https APP_URL or behind a proxy, unless MAIL_FAKE_EXPOSE=1', () => {
    expect(mailFakeProblem({ ...base, APP_URL: 'https://setline.example.test' })).toMatch(/MAIL_FAKE_EXPOSE=1/)
    expect(mailFakeProblem({ ...base, TRUST_PROXY: true })).toMatch(/TRUST_PROXY=1/)
    expect(mailFakeProblem({ ...base, APP_URL: 'https://setline.example.test', MAIL_FAKE_EXPOSE: true })).toBeUndefined()
    expect(mailFakeProblem({ ...base, MAIL_FAKE: false, APP_URL: 'https://setline.example.test' })).toBeUndefined()
  })
})
