// pg-boss's own tables (the `pgboss` schema) belong to the migration step, like Setline's:
// `npm run db:migrate` installs or upgrades them through pg-boss itself (its start with
// migrate on: it creates the schema when missing and runs its own upgrades), so the app, which
// starts pg-boss with migrate off (server/utils/jobs.ts), can run as a database role without
// DDL rights. Setline's queues are made here too (server/utils/job-queues.ts), and the
// scheduler's own queue by starting pg-boss's scheduler once; supervise is off and the boss is
// stopped at once: this start only installs, it runs no work.
import PgBoss from 'pg-boss'
import { JOB_NAMES, queueOptions } from '../../server/utils/job-queues'

function bossFor(url: string, migrate: boolean) {
  // schedule on when installing: pg-boss's scheduler makes its own queue (a table) as it starts
  const boss = new PgBoss({ connectionString: url, max: 1, supervise: false, schedule: migrate, migrate, application_name: 'setline-migrate' })
  // a failed start rejects start(); the emitter's errors would otherwise be unhandled
  boss.on('error', () => {})
  return boss
}

/** Installs or upgrades pg-boss's schema on `url`, and creates Setline's queues (each a table). */
export async function installJobQueue(url: string) {
  const boss = bossFor(url, true)
  try {
    await boss.start()
    for (const name of JOB_NAMES) {
      await boss.createQueue(name, queueOptions(name))
      // a queue made by an older Setline takes today's policy (its waiting jobs keep theirs)
      await boss.updateQueue(name, queueOptions(name))
    }
  }
  finally {
    await boss.stop({ graceful: false })
  }
}

/** Whether pg-boss's schema is installed at the version this pg-boss needs (its own check). */
export async function jobQueueReady(url: string): Promise<boolean> {
  const boss = bossFor(url, false)
  try {
    await boss.start()
    return true
  }
  catch {
    return false
  }
  finally {
    await boss.stop({ graceful: false }).catch(() => {})
  }
}
