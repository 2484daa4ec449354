// Profiles: the run or enrichment a mould casts (an egg-and-dart cornice 150, a ceiling rose).
// A profile can have several identical moulds; a job item names its profile and the planner may
// use any ready mould of it. Names are unique per workshop regardless of case, so "Egg-and-dart"
// and "egg-and-dart" are one profile. Frozen once landed. No application imports here.
import type { Knex } from 'knex'

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('profiles', (t) => {
    t.bigIncrements('id')
    t.bigInteger('workshop_id').notNullable().references('workshops.id').onDelete('CASCADE').index()
    t.text('name').notNullable()
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now())
  })
  await knex.raw('CREATE UNIQUE INDEX profiles_workshop_name_unique ON profiles (workshop_id, lower(name))')
  await knex.schema.alterTable('moulds', (t) => {
    t.bigInteger('profile_id').references('profiles.id').onDelete('SET NULL').index()
  })
  await knex.schema.alterTable('job_items', (t) => {
    t.bigInteger('profile_id').references('profiles.id').onDelete('SET NULL')
  })
  // the items' free-text profiles become profiles, each item linked to its own
  await knex.raw(`INSERT INTO profiles (workshop_id, name)
    SELECT DISTINCT ON (workshop_id, lower(btrim(profile))) workshop_id, btrim(profile) FROM job_items
    WHERE profile IS NOT NULL AND btrim(profile) <> '' ORDER BY workshop_id, lower(btrim(profile)), id`)
  await knex.raw(`UPDATE job_items i SET profile_id = p.id FROM profiles p
    WHERE p.workshop_id = i.workshop_id AND lower(p.name) = lower(btrim(i.profile))`)
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable('job_items', (t) => {
    t.dropColumn('profile_id')
  })
  await knex.schema.alterTable('moulds', (t) => {
    t.dropColumn('profile_id')
  })
  await knex.schema.dropTableIfExists('profiles')
}
