// An action id is bound to what it did: besides the step's kind and the person (user_id), the
// row it acted on (a pour, a piece, or a job for a dispatch note). A replay of the id for
// another row, step or person is then refused instead of being handed the first answer.
// Rows recorded before this migration keep entity_id NULL (their row is not known).
import type { Knex } from 'knex'

export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('processed_actions', (t) => {
    t.bigInteger('entity_id')
  })
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable('processed_actions', (t) => {
    t.dropColumn('entity_id')
  })
}
