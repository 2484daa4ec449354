// The workshop's locale: how its days and numbers are written (shared/utils/workshop-format.ts
// says what each locale means). Existing workshops keep the style they had, en-GB.
// Frozen once landed. No application imports here.
import type { Knex } from 'knex'

export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('workshops', (t) => {
    t.text('locale').notNullable().defaultTo('en-GB').checkIn(['en-GB', 'en-US'], 'workshops_locale_check')
  })
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable('workshops', (t) => {
    t.dropChecks('workshops_locale_check')
    t.dropColumn('locale')
  })
}
