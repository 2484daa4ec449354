// Shift breaks: the times in each working day when the workshop stops (tea, lunch). Kept on
// the workshop as a JSON array of local wall-clock pairs, [{ "start": "10:00", "end": "10:15" }],
// the same every working day, like the shift hours beside them. The planner starts no mix
// that would run into one and the board draws them on its ruler. A workshop starts with none,
// so plans made before this change stay as they were. Frozen once landed. No application imports here.
import type { Knex } from 'knex'

export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('workshops', (t) => {
    t.jsonb('shift_breaks').notNullable().defaultTo(knex.raw('\'[]\'::jsonb'))
  })
  await knex.raw('ALTER TABLE workshops ADD CONSTRAINT workshops_shift_breaks_array CHECK (jsonb_typeof(shift_breaks) = \'array\' AND jsonb_array_length(shift_breaks) <= 6)')
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw('ALTER TABLE workshops DROP CONSTRAINT IF EXISTS workshops_shift_breaks_array')
  await knex.schema.alterTable('workshops', (t) => {
    t.dropColumn('shift_breaks')
  })
}
