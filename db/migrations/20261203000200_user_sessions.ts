// Sessions recorded on the server: the sealed cookie carries a random session id and this
// table holds its SHA-256, so signing out (or a lead disabling someone) ends the session
// for every copy of the cookie, not only the one in the browser that signed out (OWASP
// Session Management Cheat Sheet, "Session Expiration" and "Manual Session Expiration").
// Frozen once landed. No application imports here.
import type { Knex } from 'knex'

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('user_sessions', (t) => {
    t.bigIncrements('id')
    t.bigInteger('workshop_id').notNullable().references('workshops.id').onDelete('CASCADE')
    t.bigInteger('user_id').notNullable().references('users.id').onDelete('CASCADE')
    t.text('token_hash').notNullable().unique()
    t.bigInteger('tablet_id').references('tablet_devices.id').onDelete('CASCADE')
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now())
    t.timestamp('expires_at', { useTz: true }).notNullable()
    t.timestamp('ended_at', { useTz: true })
  })
  // ending every live session of a person (password reset, disable, role change) or of a tablet
  await knex.raw('CREATE INDEX user_sessions_live_user ON user_sessions (user_id) WHERE ended_at IS NULL')
  await knex.raw('CREATE INDEX user_sessions_live_tablet ON user_sessions (tablet_id) WHERE ended_at IS NULL AND tablet_id IS NOT NULL')
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTableIfExists('user_sessions')
}
