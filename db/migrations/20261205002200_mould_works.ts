// Mould work as planned work: a new mould being made, or one away for repair. Its stages
// (model or squeeze, running or modelling, case, mould) with lead times in working days, who
// does it, and the day the mould is available from (a repair's return date). The planner never
// uses the mould before that day. One open work per mould. Frozen once landed. No application imports here.
import type { Knex } from 'knex'

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('mould_works', (t) => {
    t.bigIncrements('id')
    t.bigInteger('workshop_id').notNullable().references('workshops.id').onDelete('CASCADE').index()
    t.bigInteger('mould_id').notNullable().references('moulds.id').onDelete('CASCADE').index()
    t.text('kind').notNullable().checkIn(['new', 'repair'], 'mould_works_kind_check')
    t.jsonb('stages').notNullable().defaultTo('[]')
    t.bigInteger('assigned_to').references('users.id').onDelete('SET NULL')
    t.date('started_on').notNullable()
    t.date('available_from').notNullable()
    t.text('state').notNullable().defaultTo('open').checkIn(['open', 'done'], 'mould_works_state_check')
    t.text('notes')
    t.integer('version').notNullable().defaultTo(1)
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now())
    t.timestamp('updated_at', { useTz: true }).notNullable().defaultTo(knex.fn.now())
  })
  await knex.raw('ALTER TABLE mould_works ADD CONSTRAINT mould_works_dates CHECK (available_from >= started_on)')
  await knex.raw(`CREATE UNIQUE INDEX mould_works_one_open ON mould_works (mould_id) WHERE state = 'open'`)
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTableIfExists('mould_works')
}
