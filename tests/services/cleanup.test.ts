// The nightly clean-up removes what has served its use — old sent mail, mail failed for good
// long ago, old answered tablet actions, ended rate-limit counters — and keeps the rest.
import { randomUUID } from 'node:crypto'
import { afterAll, describe, expect, it } from 'vitest'
import { testDb } from '../setup/fixtures'
import { closeDb } from '../../server/utils/db'
import { cleanUpOldRows } from '../../server/services/cleanup'

afterAll(async () => {
  await closeDb()
})

describe('cleanUpOldRows', () => {
  it('deletes sent and failed mail past SENT_MAIL_KEEP_DAYS, old actions and ended limits, and nothing newer or still queued', async () => {
    const db = testDb()
    const ws = Number((await db('workshops').first('id')).id)
    const ago = (days: number) => db.raw(`now() - make_interval(days => ?)`, [days])
    const mail = (key: string, status: string, days: number) => ({ workshop_id: ws, to_email: `${key}@example.test`, kind: 'test', subject: key, text: 'x',
      dedupe_key: `cleanup:${key}`, status, created_at: ago(days), sent_at: status === 'sent' ? ago(days) : null })
    await db('mail_outbox').insert([mail('old-sent', 'sent', 91), mail('new-sent', 'sent', 10), mail('old-failed', 'failed', 200), mail('old-queued', 'queued', 200)])
    const [oldAction, newAction] = [randomUUID(), randomUUID()]
    await db('processed_actions').insert([
      { id: oldAction, workshop_id: ws, kind: 'test', status: 200, result: '{}', created_at: ago(31) },
      { id: newAction, workshop_id: ws, kind: 'test', status: 200, result: '{}', created_at: ago(1) },
    ])
    await db('rate_limits').insert([{ key: 'cleanup:ended', points: 3, expire: Date.now() - 1000 }, { key: 'cleanup:running', points: 3, expire: Date.now() + 600_000 }])

    const removed = await cleanUpOldRows()

    expect(removed.mail).toBeGreaterThanOrEqual(2)
    expect((await db('mail_outbox').where('dedupe_key', 'like', 'cleanup:%').pluck('subject')).sort()).toEqual(['new-sent', 'old-queued'])
    expect(await db('processed_actions').whereIn('id', [oldAction, newAction]).pluck('id')).toEqual([newAction])
    expect(await db('rate_limits').where('key', 'like', 'cleanup:%').pluck('key')).toEqual(['cleanup:running'])
  })
})
