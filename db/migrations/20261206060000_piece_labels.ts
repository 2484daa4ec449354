// A printed label per piece: the random token its QR code carries. The token is no credential:
// a scan opens the piece only for a signed-in person of the piece's workshop. A lead revokes a
// label (lost, misprinted, stuck on the wrong cast) and the next print draws a new token; a
// revoked token stays stored so its scan can say it was revoked. One live label per piece.
import type { Knex } from 'knex'

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('piece_labels', (t) => {
    t.bigIncrements('id')
    t.bigInteger('workshop_id').notNullable().references('workshops.id').onDelete('CASCADE')
    t.bigInteger('piece_id').notNullable().references('pieces.id').onDelete('CASCADE')
    t.text('token').notNullable().unique()
    t.bigInteger('created_by').references('users.id').onDelete('SET NULL')
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now())
    t.timestamp('revoked_at', { useTz: true })
    t.bigInteger('revoked_by').references('users.id').onDelete('SET NULL')
    t.index(['workshop_id', 'piece_id'])
  })
  await knex.raw('CREATE UNIQUE INDEX piece_labels_one_live ON piece_labels (piece_id) WHERE revoked_at IS NULL')
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTableIfExists('piece_labels')
}
