// @socket.io/postgres-adapter passes events between app instances with LISTEN/NOTIFY and
// keeps payloads too large for a NOTIFY in this table (its documented layout).
import type { Knex } from 'knex'

export async function up(knex: Knex): Promise<void> {
  await knex.raw(`CREATE TABLE socket_io_attachments (
    id bigserial UNIQUE,
    created_at timestamptz DEFAULT now(),
    payload bytea
  )`)
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTableIfExists('socket_io_attachments')
}
