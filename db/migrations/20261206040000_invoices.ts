// Invoices: per stage of a job or per dispatch note, numbered per workshop (INV-0001), in the
// workshop currency's minor unit. An invoice once issued is never edited: it is voided with a
// reason (a credit note in the accounts' words) and a new one issued. The deposit paid is credited
// once, on the first invoices of the job, as deposit_credit.
import type { Knex } from 'knex'

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('invoices', (t) => {
    t.bigIncrements('id')
    t.bigInteger('workshop_id').notNullable().references('workshops.id').onDelete('CASCADE')
    t.bigInteger('job_id').notNullable().references('jobs.id').onDelete('RESTRICT')
    t.integer('number').notNullable()
    t.bigInteger('dispatch_id').references('dispatches.id').onDelete('RESTRICT')
    t.text('stage')
    t.text('status').notNullable().defaultTo('issued').checkIn(['issued', 'void'], 'invoices_status_check')
    t.jsonb('lines').notNullable()
    t.text('currency').notNullable()
    t.bigInteger('net').notNullable()
    t.bigInteger('tax').notNullable()
    t.bigInteger('total').notNullable()
    t.bigInteger('deposit_credit').notNullable().defaultTo(0)
    t.bigInteger('amount_due').notNullable()
    t.text('void_reason')
    t.bigInteger('issued_by').references('users.id').onDelete('SET NULL')
    t.timestamp('issued_at', { useTz: true }).notNullable().defaultTo(knex.fn.now())
    t.timestamp('voided_at', { useTz: true })
    t.unique(['workshop_id', 'number'])
    t.index(['workshop_id', 'job_id'])
  })
  await knex.raw(`ALTER TABLE invoices ADD CONSTRAINT invoices_what_check CHECK (dispatch_id IS NOT NULL OR stage IS NOT NULL),
    ADD CONSTRAINT invoices_amounts_check CHECK (net >= 0 AND tax >= 0 AND total = net + tax AND deposit_credit >= 0 AND deposit_credit <= total AND amount_due = total - deposit_credit),
    ADD CONSTRAINT invoices_void_check CHECK ((status = 'void') = (void_reason IS NOT NULL))`)
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('invoices')
}
