// The mail outbox on the background queue: claimed, committed, then sent. Two senders on
// separate connection pools (as two app instances are) and two pg-boss workers on one database
// send each mail exactly once; a mail the relay refuses is retried and then sent.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import knex, { type Knex } from 'knex'
import { testDb } from '../setup/fixtures'
import { closeDb } from '../../server/utils/db'
import { deliverMailBatch } from '../../server/utils/mail'
import { startSmtpFake, type SmtpFake } from '../../server/utils/smtp-fake'
import { startBackgroundWork, type BackgroundWork, type JobHandlers } from '../../server/utils/jobs'
import { freePort } from '../setup/throwaway-db'

let fake: SmtpFake
const pools: Knex[] = []
const pool = () => {
  const k = knex({ client: 'pg', connection: process.env.DATABASE_URL!, pool: { min: 0, max: 3 } })
  pools.push(k)
  return k
}

beforeAll(async () => {
  fake = await startSmtpFake(await freePort())
  // read once by appEnv(), before any mail code runs
  Object.assign(process.env, { MAIL_FAKE: '1', SMTP_HOST: '127.0.0.1', SMTP_PORT: String(fake.port), MAIL_RETRY_BASE_SECONDS: '1', MAIL_WORKER_INTERVAL_MS: '500', OVERDUE_CHECK_INTERVAL_MS: '3600000', LOG_LEVEL: 'warn' })
})
afterAll(async () => {
  await Promise.all(pools.map(p => p.destroy()))
  await fake.close()
  await closeDb()
})

async function queue(prefix: string, n: number, workshopId: number | null = null) {
  const rows = Array.from({ length: n }, (_, i) => ({ workshop_id: workshopId, to_email: `${prefix}-${i}@example.test`, kind: 'test', subject: `${prefix} ${i}`, text: 'x', dedupe_key: `${prefix}:${i}` }))
  await testDb()('mail_outbox').insert(rows)
  return rows.map(r => r.to_email)
}

const sentTo = (to: string) => fake.messages.filter(m => m.to.includes(to)).length

describe('claim, commit, then send', () => {
  it('two senders on their own pools, running at once, send each of 60 mails once', async () => {
    const addresses = await queue('pair', 60)
    const [a, b] = [pool(), pool()]
    for (let round = 0; round < 4; round++) await Promise.all([deliverMailBatch(a), deliverMailBatch(b), deliverMailBatch(a), deliverMailBatch(b)])
    expect(addresses.map(sentTo)).toEqual(addresses.map(() => 1))
    const rows = await testDb()('mail_outbox').whereIn('to_email', addresses).select('status', 'attempts')
    expect(rows.every(r => r.status === 'sent' && r.attempts === 1)).toBe(true)
  })

  it('holds no row lock while the relay is talked to: a claimed mail is committed as sending', async () => {
    const [to] = await queue('claim', 1)
    const { mailOutboxRepo } = await import('../../server/repos/mail-outbox')
    const claimed = await mailOutboxRepo.claimDue(pool(), 100, 600)
    expect(claimed.map(c => c.to_email)).toContain(to)
    // another connection sees the claim at once and can update the row without waiting
    const row = await testDb()('mail_outbox').where({ to_email: to }).first('status', 'attempts')
    expect(row).toEqual({ status: 'sending', attempts: 1 })
    await testDb()('mail_outbox').where({ to_email: to }).update({ claimed_until: testDb().raw(`now() - interval '1 second'`) })
    // a claim that ran out (its process died) is claimed again
    expect((await mailOutboxRepo.claimDue(pool(), 100, 600)).map(c => c.to_email)).toContain(to)
  })

  it('a mail sent again after a crash before its sent mark carries the same Message-ID', async () => {
    const [to] = await queue('crash', 1)
    await deliverMailBatch(pool())
    // the process died after the relay took the mail and before it marked it sent: the row is
    // still claimed, and its claim runs out
    await testDb()('mail_outbox').where({ to_email: to }).update({ status: 'sending', sent_at: null, claimed_until: testDb().raw(`now() - interval '1 second'`) })
    await deliverMailBatch(pool())
    const copies = fake.messages.filter(m => m.to.includes(to!))
    expect(copies).toHaveLength(2)
    const token = (await testDb()('mail_outbox').where({ to_email: to }).first('message_token')).message_token
    // setline.example.test is the domain of the default MAIL_FROM (server/utils/env.ts)
    expect(copies.map(c => c.messageId)).toEqual([`<${token}@setline.example.test>`, `<${token}@setline.example.test>`])
    // another mail has a Message-ID of its own
    const [other] = await queue('crash-other', 1)
    await deliverMailBatch(pool())
    expect(fake.messages.find(m => m.to.includes(other!))!.messageId).not.toBe(copies[0]!.messageId)
  })

  it('a mail the relay refuses is queued again with its error, then sent on a later run', async () => {
    const workshopId = Number((await testDb()('workshops').first('id')).id)
    fake.refuseNext(workshopId, 1)
    const [to] = await queue('retry', 1, workshopId)
    await deliverMailBatch(pool())
    const failed = await testDb()('mail_outbox').where({ to_email: to }).first('status', 'attempts', 'last_error', 'claimed_until')
    expect(failed).toMatchObject({ status: 'queued', attempts: 1, claimed_until: null })
    expect(failed.last_error).toBeTruthy()
    await expect.poll(async () => {
      await deliverMailBatch(pool())
      return (await testDb()('mail_outbox').where({ to_email: to }).first('status', 'attempts'))
    }, { timeout: 10_000, interval: 300 }).toEqual({ status: 'sent', attempts: 2 })
    expect(sentTo(to!)).toBe(1)
  })

  it('sends a mail\'s attachment with it, the same bytes after a refused first attempt', async () => {
    const workshopId = Number((await testDb()('workshops').first('id')).id)
    const pdf = Buffer.concat([Buffer.from('%PDF-1.7\n'), Buffer.from([0, 1, 2, 254, 255])])
    const { mailOutboxRepo } = await import('../../server/repos/mail-outbox')
    const to = 'attached@example.test'
    await mailOutboxRepo.insert(testDb(), {
      workshop_id: workshopId, user_id: null, to_email: to, kind: 'invoice', subject: 'Invoice INV-0042', text: 'x', dedupe_key: 'attached:1',
      attachment_name: 'INV-0042.pdf', attachment_type: 'application/pdf', attachment: pdf,
    })
    fake.refuseNext(workshopId, 1)
    await deliverMailBatch(pool())
    expect(sentTo(to)).toBe(0)
    await expect.poll(async () => {
      await deliverMailBatch(pool())
      return sentTo(to)
    }, { timeout: 10_000, interval: 300 }).toBe(1)
    const [file] = fake.messages.find(m => m.to.includes(to))!.attachments
    expect(file).toMatchObject({ name: 'INV-0042.pdf', type: 'application/pdf', size: pdf.length })
    expect(Buffer.from(file!.base64, 'base64').equals(pdf)).toBe(true)
    // an attachment needs its name and type: the table refuses a half one
    await expect(testDb()('mail_outbox').insert({ workshop_id: workshopId, to_email: to, kind: 'invoice', subject: 's', text: 'x', attachment: pdf })).rejects.toThrow(/mail_outbox_attachment_check/)
  })
})

describe('two queue workers on one database', () => {
  it('send each mail once, every kick from either absorbed into a run', async () => {
    const workers: BackgroundWork[] = []
    const handlers = (k: Knex): JobHandlers => ({
      'mail-now': () => deliverMailBatch(k),
      'mail-sweep': () => deliverMailBatch(k),
      'overdue-check': async () => 0,
      'cleanup': async () => 0,
    })
    try {
      workers.push(await startBackgroundWork(process.env.DATABASE_URL!, handlers(pool())))
      workers.push(await startBackgroundWork(process.env.DATABASE_URL!, handlers(pool())))
      const addresses = await queue('workers', 50)
      await Promise.all(workers.flatMap(w => [w.send('mail-now'), w.send('mail-now')]))
      await expect.poll(async () => Number((await testDb()('mail_outbox').whereIn('to_email', addresses).where('status', 'sent').count('* as n'))[0]!.n),
        { timeout: 30_000, interval: 300 }).toBe(50)
      expect(addresses.map(sentTo)).toEqual(addresses.map(() => 1))
      const runs = await testDb()('background_runs').whereIn('job', ['mail-now', 'mail-sweep']).select('job', 'ok')
      expect(runs.length).toBeGreaterThan(0)
      expect(runs.every(r => r.ok !== false)).toBe(true)
    }
    finally {
      await Promise.all(workers.map(w => w.stop()))
    }
  })

  it('a worker that died mid-run holds up nobody\'s mail: its claim runs out and another worker sends it', async () => {
    const { mailOutboxRepo } = await import('../../server/repos/mail-outbox')
    // worker A claims due mail for 2 s, then never finishes its run: as a process killed mid-send
    // leaves it, its queue job stays running and its claim runs out. Released at the end only.
    let release!: () => void
    const dead = new Promise<number>(resolve => release = () => resolve(0))
    const stalled = (k: Knex) => async () => {
      await mailOutboxRepo.claimDue(k, 100, 2)
      return dead
    }
    const a = pool()
    const workers: BackgroundWork[] = []
    try {
      workers.push(await startBackgroundWork(process.env.DATABASE_URL!, { 'mail-now': stalled(a), 'mail-sweep': stalled(a), 'overdue-check': async () => 0, 'cleanup': async () => 0 }))
      const [to] = await queue('stalled', 1)
      await workers[0]!.send('mail-now')
      await expect.poll(async () => (await testDb()('mail_outbox').where({ to_email: to }).first('status'))?.status, { timeout: 10_000, interval: 100 }).toBe('sending')
      const b = pool()
      workers.push(await startBackgroundWork(process.env.DATABASE_URL!, { 'mail-now': () => deliverMailBatch(b), 'mail-sweep': () => deliverMailBatch(b), 'overdue-check': async () => 0, 'cleanup': async () => 0 }))
      // B's sweep (every 500 ms here) takes the mail once A's claim has run out, while A's runs still hang
      await expect.poll(async () => (await testDb()('mail_outbox').where({ to_email: to }).first('status'))?.status, { timeout: 20_000, interval: 250 }).toBe('sent')
      expect(sentTo(to!)).toBe(1)
    }
    finally {
      release()
      await Promise.all(workers.map(w => w.stop()))
    }
  })
})
