// The floor's calibration record: per demoulded pour, the plaster model's predicted minutes from
// the start of mixing to demould-ready (set factor 1, so calibration never feeds on itself) and
// the minutes the cast actually stayed before it came out. The grade's calibration_factor is the
// median ratio over these pairs (calibrationFactor in shared/utils/plaster-set.ts).
import type { Knex } from 'knex'

export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('pours', (t) => {
    t.decimal('predicted_demould_minutes', 8, 2)
    t.decimal('actual_demould_minutes', 8, 2)
  })
  await knex.raw('CREATE INDEX pours_grade_calibration ON pours (workshop_id, grade_id, demoulded_at) WHERE actual_demould_minutes IS NOT NULL')
  await knex.raw('CREATE INDEX processed_actions_workshop ON processed_actions (workshop_id, created_at)')
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw('DROP INDEX IF EXISTS processed_actions_workshop')
  await knex.raw('DROP INDEX IF EXISTS pours_grade_calibration')
  await knex.schema.alterTable('pours', (t) => {
    t.dropColumn('actual_demould_minutes')
    t.dropColumn('predicted_demould_minutes')
  })
}
