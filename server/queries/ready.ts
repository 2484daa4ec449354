// The read behind GET /api/ready: the mail backlog and each background job's last run.
import type { Knex } from 'knex'
import type { ReadyDto } from '#shared/types/ready'
import { mailOutboxRepo } from '../repos/mail-outbox'
import { backgroundRunsRepo } from '../repos/background-runs'

export async function readiness(db: Knex): Promise<Pick<ReadyDto, 'mail' | 'jobs'>> {
  const [mail, runs] = await Promise.all([mailOutboxRepo.backlog(db), backgroundRunsRepo.all(db)])
  return {
    mail: { backlog: mail.count, oldestSeconds: mail.oldestSeconds },
    jobs: runs.map(r => ({
      job: r.job,
      lastStartedAt: r.started_at.toISOString(),
      lastFinishedAt: r.finished_at?.toISOString() ?? null,
      ok: r.ok,
      items: r.items,
    })),
  }
}
