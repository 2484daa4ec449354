// Deposits and payments. A job may ask a deposit before its moulds are started (jobs.deposit_minor,
// in the workshop currency's minor unit); payments are taken through the hosted payment service
// (method 'card': Setline keeps the service's references, never card data) or recorded by a lead
// when taken another way. payment_webhooks keeps every webhook event id once, so a replayed event
// changes nothing.
import type { Knex } from 'knex'

export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('jobs', (t) => {
    t.bigInteger('deposit_minor').notNullable().defaultTo(0)
  })
  await knex.schema.createTable('payments', (t) => {
    t.bigIncrements('id')
    t.bigInteger('workshop_id').notNullable().references('workshops.id').onDelete('CASCADE')
    t.bigInteger('job_id').notNullable().references('jobs.id').onDelete('CASCADE')
    t.text('purpose').notNullable().defaultTo('deposit').checkIn(['deposit', 'invoice'], 'payments_purpose_check')
    t.bigInteger('amount').notNullable()
    t.text('currency').notNullable()
    t.text('method').notNullable().checkIn(['card', 'bank_transfer', 'cash', 'cheque', 'other'], 'payments_method_check')
    t.text('status').notNullable().checkIn(['pending', 'paid', 'refunded', 'cancelled'], 'payments_status_check')
    t.text('provider_ref').unique()
    t.text('provider_payment')
    t.bigInteger('recorded_by').references('users.id').onDelete('SET NULL')
    t.text('note')
    t.timestamp('paid_at', { useTz: true })
    t.timestamp('refunded_at', { useTz: true })
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now())
    t.index(['workshop_id', 'job_id'])
  })
  await knex.raw('ALTER TABLE payments ADD CONSTRAINT payments_amount_check CHECK (amount > 0)')
  await knex.schema.createTable('payment_webhooks', (t) => {
    t.text('event_id').primary()
    t.text('type').notNullable()
    t.text('outcome').notNullable()
    t.timestamp('received_at', { useTz: true }).notNullable().defaultTo(knex.fn.now())
  })
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('payment_webhooks')
  await knex.schema.dropTable('payments')
  await knex.schema.alterTable('jobs', (t) => {
    t.dropColumn('deposit_minor')
  })
}
