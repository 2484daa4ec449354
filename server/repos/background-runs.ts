// Every knex call for background_runs: each background job's last run (server/utils/jobs.ts),
// read by the readiness route. One row per job name, across every app instance.
import type { Knex } from 'knex'

export interface BackgroundRunRow { job: string; started_at: Date; finished_at: Date | null; ok: boolean | null; items: number }

export const backgroundRunsRepo = {
  started(db: Knex, job: string) {
    return db('background_runs').insert({ job, started_at: db.fn.now(), finished_at: null, ok: null, items: 0 })
      .onConflict('job').merge(['started_at', 'finished_at', 'ok', 'items'])
  },
  finished(db: Knex, job: string, ok: boolean, items: number) {
    return db('background_runs').where({ job }).update({ finished_at: db.fn.now(), ok, items })
  },
  all(db: Knex): Promise<BackgroundRunRow[]> {
    return db('background_runs').select('job', 'started_at', 'finished_at', 'ok', 'items').orderBy('job')
  },
}
