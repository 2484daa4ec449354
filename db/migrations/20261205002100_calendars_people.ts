// Calendars and people for the planner: the shop's closures (holidays, shutdowns), each
// caster's own working days, hours, absences and mixes at once, and a bench's mixes at once.
// A caster's days or hours left null are the workshop's. Frozen once landed. No application imports here.
import type { Knex } from 'knex'

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('shop_closures', (t) => {
    t.bigIncrements('id')
    t.bigInteger('workshop_id').notNullable().references('workshops.id').onDelete('CASCADE').index()
    t.date('from_day').notNullable()
    t.date('to_day').notNullable()
    t.text('reason')
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now())
  })
  await knex.raw('ALTER TABLE shop_closures ADD CONSTRAINT shop_closures_order CHECK (to_day >= from_day)')
  await knex.schema.createTable('caster_absences', (t) => {
    t.bigIncrements('id')
    t.bigInteger('workshop_id').notNullable().references('workshops.id').onDelete('CASCADE').index()
    t.bigInteger('user_id').notNullable().references('users.id').onDelete('CASCADE').index()
    t.date('from_day').notNullable()
    t.date('to_day').notNullable()
    t.text('reason')
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now())
  })
  await knex.raw('ALTER TABLE caster_absences ADD CONSTRAINT caster_absences_order CHECK (to_day >= from_day)')
  await knex.schema.alterTable('users', (t) => {
    t.specificType('caster_days', 'smallint[]')
    t.time('caster_start')
    t.time('caster_end')
    t.integer('max_mixes').notNullable().defaultTo(1)
  })
  await knex.raw('ALTER TABLE users ADD CONSTRAINT users_max_mixes_check CHECK (max_mixes BETWEEN 1 AND 20)')
  await knex.schema.alterTable('benches', (t) => {
    t.integer('max_mixes')
  })
  await knex.raw('ALTER TABLE benches ADD CONSTRAINT benches_max_mixes_check CHECK (max_mixes IS NULL OR max_mixes BETWEEN 1 AND 100)')
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw('ALTER TABLE benches DROP CONSTRAINT IF EXISTS benches_max_mixes_check')
  await knex.schema.alterTable('benches', (t) => {
    t.dropColumn('max_mixes')
  })
  await knex.raw('ALTER TABLE users DROP CONSTRAINT IF EXISTS users_max_mixes_check')
  await knex.schema.alterTable('users', (t) => {
    t.dropColumn('max_mixes')
    t.dropColumn('caster_end')
    t.dropColumn('caster_start')
    t.dropColumn('caster_days')
  })
  await knex.schema.dropTableIfExists('caster_absences')
  await knex.schema.dropTableIfExists('shop_closures')
}
