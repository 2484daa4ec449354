// pg-boss's schema and Setline's queues are made by the migration step (db/local/job-queue.ts),
// never by an app start: the app starts pg-boss with migrate off, so it creates no table (a
// new pg-boss queue is a table of its own) and refuses a database that was not migrated.
import { describe, expect, it } from 'vitest'
import { testDb } from '../setup/fixtures'
import { migrate } from '../../db/local/cluster'
import { startBackgroundWork, type JobHandlers } from '../../server/utils/jobs'
import { JOB_NAMES, queueOptions } from '../../server/utils/job-queues'

const url = () => process.env.DATABASE_URL!
const pgbossRelations = async () => Number((await testDb().raw(`SELECT count(*) AS n FROM pg_class c JOIN pg_namespace n ON n.oid = c.relnamespace WHERE n.nspname = 'pgboss'`)).rows[0].n)

describe('the job queue schema belongs to db:migrate', () => {
  it('a migrated database has pg-boss installed with every Setline queue, before any app started', async () => {
    // this file's database is a clone of the run's template: migrated and seeded, no app ever ran on it
    const version = await testDb().raw('SELECT version FROM pgboss.version')
    expect(Number(version.rows[0].version)).toBeGreaterThan(0)
    // Setline's queues, beside pg-boss's own scheduler queue
    expect(await testDb()('pgboss.queue').pluck('name')).toEqual(expect.arrayContaining([...JOB_NAMES]))
  })

  it('an app start refuses a database without the schema, and after migrate runs work without creating a table', async () => {
    const ran: string[] = []
    const handlers = Object.fromEntries(JOB_NAMES.map(n => [n, async () => {
      ran.push(n)
      return 0
    }])) as JobHandlers
    await testDb().raw('DROP SCHEMA pgboss CASCADE')
    await expect(startBackgroundWork(url(), handlers)).rejects.toThrow(/npm run db:migrate/)
    expect(Number((await testDb().raw(`SELECT count(*) AS n FROM pg_namespace WHERE nspname = 'pgboss'`)).rows[0].n)).toBe(0)

    await migrate(url())
    const before = await pgbossRelations()
    expect(before).toBeGreaterThan(0)
    const work = await startBackgroundWork(url(), handlers)
    try {
      await work.send('overdue-check')
      await expect.poll(() => ran.includes('overdue-check'), { timeout: 20_000 }).toBe(true)
    }
    finally {
      await work.stop()
    }
    expect(await pgbossRelations()).toBe(before)
  }, 60_000)

  it('migrate gives a queue made by an older Setline today\'s policy: the mail queues run on several instances at once', async () => {
    const policies = async () => Object.fromEntries((await testDb()('pgboss.queue').whereIn('name', [...JOB_NAMES]).select('name', 'policy')).map(q => [q.name, q.policy]))
    expect(await policies()).toEqual({ 'mail-now': 'short', 'mail-sweep': 'short', 'overdue-check': 'stately', 'cleanup': 'stately' })
    // before, every queue was one-at-a-time
    await testDb()('pgboss.queue').whereIn('name', [...JOB_NAMES]).update({ policy: 'stately' })
    await migrate(url())
    expect(await policies()).toEqual(Object.fromEntries(JOB_NAMES.map(n => [n, queueOptions(n).policy])))
    expect((await policies())['mail-sweep']).toBe('short')
  }, 60_000)
})
