// Workshop settings are edited by leads; a version column lets a second lead's stale save
// be refused instead of silently overwriting.
import type { Knex } from 'knex'

export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('workshops', (t) => {
    t.integer('version').notNullable().defaultTo(1)
  })
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable('workshops', (t) => {
    t.dropColumn('version')
  })
}
