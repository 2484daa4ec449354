// The casting register reads a job's pours through job_items in pour-id order (keyset pages of
// the CSV export); without this index each page would scan every pour of the workshop.
import type { Knex } from 'knex'

export async function up(knex: Knex): Promise<void> {
  await knex.raw('CREATE INDEX pours_job_item_id ON pours (job_item_id, id)')
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw('DROP INDEX IF EXISTS pours_job_item_id')
}
