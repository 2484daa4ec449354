// Background work in PostgreSQL (server/utils/jobs.ts): the mail outbox is claimed, committed
// and only then sent, so a mail being sent is 'sending' with a claim that runs out (a process that
// dies mid-send leaves it to be claimed again); each background job records its last run for the
// readiness route. Frozen once landed. No application imports here.
import type { Knex } from 'knex'

export async function up(knex: Knex): Promise<void> {
  await knex.raw('ALTER TABLE mail_outbox DROP CONSTRAINT mail_outbox_status_check')
  await knex.raw(`ALTER TABLE mail_outbox ADD CONSTRAINT mail_outbox_status_check CHECK (status IN ('queued', 'sending', 'sent', 'failed'))`)
  await knex.schema.alterTable('mail_outbox', (t) => {
    t.timestamp('claimed_until', { useTz: true })
  })
  // the clean-up job deletes sent mail and processed actions by age
  await knex.raw('CREATE INDEX mail_outbox_sent_at_idx ON mail_outbox (sent_at) WHERE sent_at IS NOT NULL')
  await knex.raw('CREATE INDEX processed_actions_created_at_idx ON processed_actions (created_at)')
  await knex.schema.createTable('background_runs', (t) => {
    t.text('job').primary()
    t.timestamp('started_at', { useTz: true }).notNullable()
    t.timestamp('finished_at', { useTz: true })
    t.boolean('ok')
    t.integer('items').notNullable().defaultTo(0)
  })
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTableIfExists('background_runs')
  await knex.raw('DROP INDEX IF EXISTS processed_actions_created_at_idx')
  await knex.raw('DROP INDEX IF EXISTS mail_outbox_sent_at_idx')
  await knex('mail_outbox').where('status', 'sending').update({ status: 'queued' })
  await knex.schema.alterTable('mail_outbox', (t) => {
    t.dropColumn('claimed_until')
  })
  await knex.raw('ALTER TABLE mail_outbox DROP CONSTRAINT mail_outbox_status_check')
  await knex.raw(`ALTER TABLE mail_outbox ADD CONSTRAINT mail_outbox_status_check CHECK (status IN ('queued', 'sent', 'failed'))`)
}
