// The shop's own estimate per job item, in the workshop currency's minor unit (shared/utils/money.ts),
// copied from the accepted quote's lines when a quote becomes a job; null for a job made without a
// quote. The job's cost against its estimate compares the register's actual cost with it.
import type { Knex } from 'knex'

export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('job_items', (t) => {
    t.bigInteger('estimate_minor')
  })
  await knex.raw('ALTER TABLE job_items ADD CONSTRAINT job_items_estimate_check CHECK (estimate_minor IS NULL OR estimate_minor >= 0)')
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable('job_items', (t) => {
    t.dropColumn('estimate_minor')
  })
}
