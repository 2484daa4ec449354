// A run item's corners and cuts for the run calculator: how far the cornice projects (external
// mitres and returns add it), the saw cut lost at each cut, and the leg of a corner block at
// internal corners when the run uses blocks. Each wall's two ends (square, internal, external,
// return) ride in the item's walls JSON beside its length. Null: not given (no corners that
// need it, no kerf, no blocks). Frozen once landed. No application imports here.
import type { Knex } from 'knex'

export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('job_items', (t) => {
    t.decimal('projection_m', 6, 3)
    t.decimal('saw_cut_m', 6, 4)
    t.decimal('corner_block_leg_m', 6, 3)
  })
  await knex.raw(`ALTER TABLE job_items ADD CONSTRAINT job_items_run_corners_check CHECK (
    (projection_m IS NULL OR projection_m > 0) AND (saw_cut_m IS NULL OR saw_cut_m >= 0) AND (corner_block_leg_m IS NULL OR corner_block_leg_m > 0))`)
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw('ALTER TABLE job_items DROP CONSTRAINT IF EXISTS job_items_run_corners_check')
  await knex.schema.alterTable('job_items', (t) => {
    t.dropColumn('projection_m')
    t.dropColumn('saw_cut_m')
    t.dropColumn('corner_block_leg_m')
  })
}
