// The run calculator's shortest piece per run item, so an edited run re-cuts the same way.
import type { Knex } from 'knex'

export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('job_items', (t) => {
    t.decimal('min_piece_m', 6, 3)
  })
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable('job_items', (t) => {
    t.dropColumn('min_piece_m')
  })
}
