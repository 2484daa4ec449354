// Invoice mail with its PDF, and the client's price of a job item.
// - mail_outbox carries at most one attachment (its file name, media type and bytes): an invoice
//   mail carries the invoice's PDF, made when the invoice is issued, so a retry sends the same
//   document. Other mail has none.
// - client_contacts.mail_invoices: whether the contact gets a job's invoices by mail (on unless
//   the lead turns it off, like the other job mails).
// - job_items.price_minor: the client's price for the whole item, margin included, before tax,
//   in the workshop currency's minor unit (shared/utils/money.ts), copied from the accepted
//   quote's lines when a quote becomes a job (shared/utils/quote-job.ts); null for an item made
//   without a quote. A dispatch note's invoice lines are priced from it (shared/utils/invoice-lines.ts).
import type { Knex } from 'knex'

export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('mail_outbox', (t) => {
    t.text('attachment_name')
    t.text('attachment_type')
    t.binary('attachment')
  })
  await knex.raw(`ALTER TABLE mail_outbox ADD CONSTRAINT mail_outbox_attachment_check
    CHECK ((attachment IS NULL) = (attachment_name IS NULL) AND (attachment IS NULL) = (attachment_type IS NULL))`)
  await knex.schema.alterTable('client_contacts', (t) => {
    t.boolean('mail_invoices').notNullable().defaultTo(true)
  })
  await knex.schema.alterTable('job_items', (t) => {
    t.bigInteger('price_minor')
  })
  await knex.raw('ALTER TABLE job_items ADD CONSTRAINT job_items_price_check CHECK (price_minor IS NULL OR price_minor >= 0)')
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable('job_items', (t) => {
    t.dropColumn('price_minor')
  })
  await knex.schema.alterTable('client_contacts', (t) => {
    t.dropColumn('mail_invoices')
  })
  await knex.schema.alterTable('mail_outbox', (t) => {
    t.dropColumn('attachment')
    t.dropColumn('attachment_type')
    t.dropColumn('attachment_name')
  })
}
