// Crates, deliveries, proof of delivery and calendar feeds. A job's packed pieces go into
// numbered crates (crate_pieces: one crate per piece); a delivery books crates and loose pieces
// (delivery_pieces, a copy taken at booking so the signed note keeps what went) against the job
// and its site; the proof of delivery adds the receiver, a signature (PNG), a photo and the
// pieces found broken. A workshop sets the heaviest crate it packs (crate_max_kg). A calendar
// feed link is stored as the SHA-256 of its secret and revoked by a date, never deleted.
// Frozen once landed. No application imports here.
import type { Knex } from 'knex'

export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('workshops', (t) => {
    t.decimal('crate_max_kg', 8, 3).notNullable().defaultTo(250)
  })
  await knex.schema.createTable('deliveries', (t) => {
    t.bigIncrements('id')
    t.bigInteger('workshop_id').notNullable().references('workshops.id').onDelete('CASCADE')
    t.bigInteger('job_id').notNullable().references('jobs.id').onDelete('RESTRICT')
    t.bigInteger('site_id')
    t.foreign(['workshop_id', 'site_id']).references(['workshop_id', 'id']).inTable('client_sites')
    t.date('delivery_day').notNullable()
    t.date('fixing_on')
    t.text('vehicle').notNullable()
    t.text('state').notNullable().defaultTo('booked').checkIn(['booked', 'delivered'], 'deliveries_state_check')
    t.bigInteger('booked_by').references('users.id').onDelete('SET NULL')
    t.timestamp('delivered_at', { useTz: true })
    t.text('receiver_name')
    t.binary('signature_png')
    t.uuid('photo_id').references('photos.id').onDelete('SET NULL')
    t.bigInteger('dispatch_id').references('dispatches.id').onDelete('SET NULL')
    t.bigInteger('signed_by').references('users.id').onDelete('SET NULL')
    t.integer('version').notNullable().defaultTo(1)
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now())
    t.index(['workshop_id', 'job_id'])
    t.index(['workshop_id', 'delivery_day'])
    t.unique(['workshop_id', 'id'], { indexName: 'deliveries_workshop_id_id_unique' })
  })
  await knex.schema.createTable('crates', (t) => {
    t.bigIncrements('id')
    t.bigInteger('workshop_id').notNullable().references('workshops.id').onDelete('CASCADE')
    t.bigInteger('job_id').notNullable().references('jobs.id').onDelete('RESTRICT')
    t.integer('crate_no').notNullable()
    t.bigInteger('delivery_id')
    t.foreign(['workshop_id', 'delivery_id']).references(['workshop_id', 'id']).inTable('deliveries')
    t.bigInteger('created_by').references('users.id').onDelete('SET NULL')
    t.integer('version').notNullable().defaultTo(1)
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now())
    t.unique(['workshop_id', 'job_id', 'crate_no'])
    t.unique(['workshop_id', 'id'], { indexName: 'crates_workshop_id_id_unique' })
  })
  await knex.schema.createTable('crate_pieces', (t) => {
    t.bigInteger('workshop_id').notNullable().references('workshops.id').onDelete('CASCADE')
    t.bigInteger('crate_id').notNullable()
    t.foreign(['workshop_id', 'crate_id']).references(['workshop_id', 'id']).inTable('crates').onDelete('CASCADE')
    t.bigInteger('piece_id').notNullable().primary().references('pieces.id').onDelete('CASCADE')
    t.index(['workshop_id', 'crate_id'])
  })
  await knex.schema.createTable('delivery_pieces', (t) => {
    t.bigInteger('workshop_id').notNullable().references('workshops.id').onDelete('CASCADE')
    t.bigInteger('delivery_id').notNullable()
    t.foreign(['workshop_id', 'delivery_id']).references(['workshop_id', 'id']).inTable('deliveries').onDelete('CASCADE')
    t.bigInteger('piece_id').notNullable().references('pieces.id').onDelete('CASCADE')
    t.integer('crate_no')
    t.boolean('broken').notNullable().defaultTo(false)
    t.text('broken_note')
    t.primary(['delivery_id', 'piece_id'])
    t.index(['workshop_id', 'piece_id'])
  })
  await knex.schema.createTable('calendar_feeds', (t) => {
    t.bigIncrements('id')
    t.bigInteger('workshop_id').notNullable().references('workshops.id').onDelete('CASCADE')
    t.bigInteger('job_id').references('jobs.id').onDelete('CASCADE')
    t.text('token_hash').notNullable().unique()
    t.bigInteger('created_by').references('users.id').onDelete('SET NULL')
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now())
    t.timestamp('revoked_at', { useTz: true })
    t.index(['workshop_id'])
  })
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTableIfExists('calendar_feeds')
  await knex.schema.dropTableIfExists('delivery_pieces')
  await knex.schema.dropTableIfExists('crate_pieces')
  await knex.schema.dropTableIfExists('crates')
  await knex.schema.dropTableIfExists('deliveries')
  await knex.schema.alterTable('workshops', (t) => {
    t.dropColumn('crate_max_kg')
  })
}
