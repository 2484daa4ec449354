// Each outbox row gets its own Message-ID token, fixed when the mail is queued, so a mail sent
// again after a crash between the relay's acceptance and our "sent" mark (claim-commit-send is
// at least once) carries the same Message-ID as the first copy, and mail stores and clients
// treat the two as one message (RFC 5322 §3.6.4: a Message-ID names one message).
import type { Knex } from 'knex'

export async function up(knex: Knex): Promise<void> {
  // gen_random_uuid() is built into PostgreSQL 13 and later
  await knex.raw('ALTER TABLE mail_outbox ADD COLUMN message_token uuid NOT NULL DEFAULT gen_random_uuid()')
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable('mail_outbox', (t) => {
    t.dropColumn('message_token')
  })
}
