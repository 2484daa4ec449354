// Clients and sites: a client organisation gets notes and a version, its contacts (who they are
// and which of the job mails each one receives: progress, samples, dispatch and delivery) and
// its sites (where the work goes: address, postcode and access notes for the delivery). A job
// names its site. Contacts and sites are scoped to the workshop like their organisation; a
// composite key keeps a contact or site on an organisation of the same workshop. Existing client
// users become contacts of their organisation with every mail on, so nobody stops getting mail.
// Frozen once landed. No application imports here.
import type { Knex } from 'knex'

const stamps = (t: Knex.CreateTableBuilder, knex: Knex) => {
  t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now())
  t.timestamp('updated_at', { useTz: true }).notNullable().defaultTo(knex.fn.now())
}

export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('client_orgs', (t) => {
    t.text('notes')
    t.integer('version').notNullable().defaultTo(1)
    t.unique(['workshop_id', 'id'], { indexName: 'client_orgs_workshop_id_id_unique' })
  })

  await knex.schema.createTable('client_contacts', (t) => {
    t.bigIncrements('id')
    t.bigInteger('workshop_id').notNullable().references('workshops.id').onDelete('CASCADE')
    t.bigInteger('client_org_id').notNullable()
    t.foreign(['workshop_id', 'client_org_id']).references(['workshop_id', 'id']).inTable('client_orgs').onDelete('CASCADE')
    t.text('name').notNullable()
    t.text('email').notNullable()
    t.text('phone')
    t.text('role')
    t.boolean('mail_progress').notNullable().defaultTo(true)
    t.boolean('mail_samples').notNullable().defaultTo(true)
    t.boolean('mail_dispatch').notNullable().defaultTo(true)
    t.integer('version').notNullable().defaultTo(1)
    t.index(['workshop_id', 'client_org_id'])
    stamps(t, knex)
  })
  await knex.raw('CREATE UNIQUE INDEX client_contacts_org_email_unique ON client_contacts (client_org_id, lower(email))')

  await knex.schema.createTable('client_sites', (t) => {
    t.bigIncrements('id')
    t.bigInteger('workshop_id').notNullable().references('workshops.id').onDelete('CASCADE')
    t.bigInteger('client_org_id').notNullable()
    t.foreign(['workshop_id', 'client_org_id']).references(['workshop_id', 'id']).inTable('client_orgs').onDelete('CASCADE')
    t.text('name').notNullable()
    t.text('address').notNullable()
    t.text('postcode')
    t.text('opening_hours')
    t.text('parking')
    t.text('lifting')
    t.integer('version').notNullable().defaultTo(1)
    t.unique(['workshop_id', 'client_org_id', 'name'])
    t.unique(['workshop_id', 'id'], { indexName: 'client_sites_workshop_id_id_unique' })
    stamps(t, knex)
  })

  // deleting a site leaves its jobs without one (only site_id is cleared: PostgreSQL 15's column list)
  await knex.raw(`ALTER TABLE jobs ADD COLUMN site_id bigint,
    ADD CONSTRAINT jobs_site_fk FOREIGN KEY (workshop_id, site_id) REFERENCES client_sites (workshop_id, id) ON DELETE SET NULL (site_id)`)
  await knex.raw('CREATE INDEX jobs_workshop_id_site_id_index ON jobs (workshop_id, site_id)')

  await knex.raw(`
    INSERT INTO client_contacts (workshop_id, client_org_id, name, email)
    SELECT u.workshop_id, u.client_org_id, u.name, u.email FROM users u
    JOIN client_orgs o ON o.id = u.client_org_id AND o.workshop_id = u.workshop_id
    WHERE u.role = 'client' AND u.disabled_at IS NULL
    ON CONFLICT DO NOTHING`)
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw('ALTER TABLE jobs DROP COLUMN site_id')
  await knex.schema.dropTableIfExists('client_sites')
  await knex.schema.dropTableIfExists('client_contacts')
  await knex.schema.alterTable('client_orgs', (t) => {
    t.dropUnique(['workshop_id', 'id'], 'client_orgs_workshop_id_id_unique')
    t.dropColumn('notes')
    t.dropColumn('version')
  })
}
