// First-run set-up codes: a Setline started on an empty database prints a one-time code on
// its console, and only someone who can read that console can create the first workshop and
// its lead. Only the SHA-256 of the code is kept; a code works once and until it expires.
// Not scoped to a workshop: there is none yet. Frozen once landed. No application imports here.
import type { Knex } from 'knex'

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('setup_codes', (t) => {
    t.bigIncrements('id')
    t.text('code_hash').notNullable().unique()
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now())
    t.timestamp('expires_at', { useTz: true }).notNullable()
    t.timestamp('used_at', { useTz: true })
  })
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTableIfExists('setup_codes')
}
