// A grade's calibration as a lead applied it: the factor and the number of attended pours behind
// it at that moment, and when. The live calibration_factor moves on with every demould; the
// board, planner and mix card use only the applied one (appliedSetFactor in
// shared/utils/plaster-set.ts). calibration_excluded counts the demoulds the live factor left
// out (early, late, without times) so the screen can say so.
import type { Knex } from 'knex'

export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('plaster_grades', (t) => {
    t.decimal('calibration_applied_factor', 6, 3)
    t.integer('calibration_applied_count').notNullable().defaultTo(0)
    t.timestamp('calibration_applied_at', { useTz: true })
    t.integer('calibration_excluded').notNullable().defaultTo(0)
  })
  // a grade marked applied before there was an applied factor takes its live one
  await knex('plaster_grades').where({ calibration_applied: true }).whereNotNull('calibration_factor')
    .update({ calibration_applied_factor: knex.ref('calibration_factor'), calibration_applied_count: knex.ref('calibration_count'), calibration_applied_at: knex.fn.now() })
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable('plaster_grades', (t) => {
    t.dropColumn('calibration_excluded')
    t.dropColumn('calibration_applied_at')
    t.dropColumn('calibration_applied_count')
    t.dropColumn('calibration_applied_factor')
  })
}
