// What the job's actual cost is priced from, beside the register's weights and times: a price per
// bag on each plaster lot (the lot's own price, null when not known) and one hourly labour rate on
// the workshop's rates. Both in the workshop currency's minor unit (shared/utils/money.ts).
// Mould-making hours live in each mould work stage's JSON (no column). Frozen once landed.
import type { Knex } from 'knex'

export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('plaster_lots', (t) => {
    t.bigInteger('price_per_bag')
  })
  await knex.raw('ALTER TABLE plaster_lots ADD CONSTRAINT plaster_lots_price_check CHECK (price_per_bag IS NULL OR price_per_bag >= 0)')
  await knex.schema.alterTable('workshop_rates', (t) => {
    t.bigInteger('labour_per_hour').notNullable().defaultTo(0)
  })
  await knex.raw('ALTER TABLE workshop_rates ADD CONSTRAINT workshop_rates_labour_check CHECK (labour_per_hour >= 0)')
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable('workshop_rates', (t) => {
    t.dropColumn('labour_per_hour')
  })
  await knex.schema.alterTable('plaster_lots', (t) => {
    t.dropColumn('price_per_bag')
  })
}
