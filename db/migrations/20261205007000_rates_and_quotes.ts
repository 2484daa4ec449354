// Money for the office side of a job: the workshop's rates and its quotes.
// Every amount is an integer of the currency's minor unit (BIGINT; shared/utils/money.ts), one
// currency per workshop. A quote keeps every version: a version once sent is frozen (its take-off,
// lines and totals never change); a change makes the next version.
import type { Knex } from 'knex'

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('workshop_rates', (t) => {
    t.bigInteger('workshop_id').primary().references('workshops.id').onDelete('CASCADE')
    t.text('currency').notNullable().defaultTo('GBP')
    for (const c of ['plaster_per_bag', 'mould_per_profile', 'cast_per_length', 'cast_per_piece', 'fettle_per_piece', 'fix_per_metre', 'delivery_per_trip']) {
      t.bigInteger(c).notNullable().defaultTo(0)
    }
    t.integer('margin_bp').notNullable().defaultTo(0)
    t.integer('tax_bp').notNullable().defaultTo(0)
    t.integer('deposit_bp').notNullable().defaultTo(0)
    t.integer('version').notNullable().defaultTo(1)
    t.timestamp('updated_at', { useTz: true }).notNullable().defaultTo(knex.fn.now())
  })
  await knex.raw('ALTER TABLE workshop_rates ADD CONSTRAINT workshop_rates_currency_check CHECK (currency ~ \'^[A-Z]{3}$\')')

  await knex.schema.createTable('quotes', (t) => {
    t.bigIncrements('id')
    t.bigInteger('workshop_id').notNullable().references('workshops.id').onDelete('CASCADE').index()
    t.integer('number').notNullable()
    t.text('title').notNullable()
    t.bigInteger('client_org_id').references('client_orgs.id').onDelete('SET NULL')
    t.bigInteger('job_id').references('jobs.id').onDelete('SET NULL')
    t.integer('version').notNullable().defaultTo(1)
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now())
    t.timestamp('updated_at', { useTz: true }).notNullable().defaultTo(knex.fn.now())
    t.unique(['workshop_id', 'number'])
  })

  await knex.schema.createTable('quote_versions', (t) => {
    t.bigIncrements('id')
    t.bigInteger('workshop_id').notNullable().references('workshops.id').onDelete('CASCADE')
    t.bigInteger('quote_id').notNullable().references('quotes.id').onDelete('CASCADE')
    t.integer('revision').notNullable()
    t.text('status').notNullable().defaultTo('draft')
      .checkIn(['draft', 'sent', 'accepted', 'changes_requested', 'superseded'], 'quote_versions_status_check')
    t.jsonb('take_off').notNullable()
    t.jsonb('lines').notNullable()
    t.text('currency').notNullable()
    t.bigInteger('net').notNullable()
    t.bigInteger('tax').notNullable()
    t.bigInteger('total').notNullable()
    t.bigInteger('estimate').notNullable()
    t.bigInteger('deposit').notNullable()
    t.timestamp('sent_at', { useTz: true })
    t.timestamp('decided_at', { useTz: true })
    t.text('decision_comment')
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now())
    t.unique(['quote_id', 'revision'])
    t.index(['workshop_id', 'quote_id'])
  })
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('quote_versions')
  await knex.schema.dropTable('quotes')
  await knex.schema.dropTable('workshop_rates')
}
