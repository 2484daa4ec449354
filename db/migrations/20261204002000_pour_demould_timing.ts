// When a cast came out against its window: 'early' (before the window opened: the caster was
// asked first), 'in_window', or 'late' (after it closed: nobody attended the opening). Only
// in-window demoulds measure the set time, so only they feed the grade's calibration. Pours
// demoulded before this column existed are classified from their recorded times.
import type { Knex } from 'knex'

export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('pours', (t) => {
    t.text('demould_timing')
  })
  await knex.raw(`ALTER TABLE pours ADD CONSTRAINT pours_demould_timing_check CHECK (demould_timing IN ('early', 'in_window', 'late'))`)
  await knex.raw(`UPDATE pours SET demould_timing = CASE
      WHEN demoulded_at < demould_open_at THEN 'early'
      WHEN demoulded_at > demould_close_at THEN 'late'
      ELSE 'in_window' END
    WHERE demoulded_at IS NOT NULL`)
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable('pours', (t) => {
    t.dropColumn('demould_timing')
  })
}
