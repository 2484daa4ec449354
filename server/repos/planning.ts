// The planner's reads: everything planPours needs about a workshop, each in its workshop.
import type { Knex } from 'knex'
import { DEPOSIT_RELEASED } from './payments'

/**
 * A pour that counts towards its item's pieces (SQL on a pour aliased `p`): not void, and not
 * one whose piece was rejected in finishing. A rejected piece so returns its item's count to the
 * planner, which plans one more cast; a piece in repair still counts until it is rejected.
 */
export const COUNTED_POUR = `p.state <> 'void' AND NOT EXISTS (SELECT 1 FROM pieces rj
  WHERE rj.pour_id = p.id AND rj.workshop_id = p.workshop_id AND rj.state = 'rejected')`

export const planningRepo = {
  moulds(db: Knex, workshopId: number) {
    return db('moulds').select('id', 'code', 'bench_id', 'state', 'prep_minutes', 'clean_minutes', 'max_dwell_minutes', 'pulls', 'expected_pulls', 'profile_id', 'cavity_litres')
      .where({ workshop_id: workshopId }).orderBy('code')
  },
  /**
   * Items of open jobs with the pieces still to plan: needed less the item's counted pours
   * (COUNTED_POUR: not void, and not a pour whose piece the finisher rejected).
   */
  openItems(db: Knex, workshopId: number) {
    return db('job_items as i').join('jobs as j', function () {
      this.on('j.id', 'i.job_id').andOn('j.workshop_id', 'i.workshop_id')
    })
      .select('i.id', 'i.job_id', 'i.description', 'i.mould_id', 'i.grade_id', 'i.consistency', 'i.pieces_needed',
        'j.code as job_code', 'j.due_on', 'j.sample_required', 'j.sample_state')
      .select(db.raw(`${DEPOSIT_RELEASED('j')} AS deposit_released`))
      // the item's profile, linked or named (a profile made after the item still matches by name)
      .select(db.raw(`COALESCE(i.profile_id, (SELECT pr.id FROM profiles pr WHERE pr.workshop_id = i.workshop_id
        AND lower(pr.name) = lower(btrim(i.profile)))) AS profile_id`))
      .select(db.raw(`(SELECT count(*)::int FROM pours p WHERE p.workshop_id = i.workshop_id AND p.job_item_id = i.id AND ${COUNTED_POUR}) AS pours`))
      .where({ 'i.workshop_id': workshopId, 'j.state': 'open' })
      .orderBy(['i.id'])
  },
  grades(db: Knex, workshopId: number) {
    return db('plaster_grades').select('*').where({ workshop_id: workshopId }).orderBy('id')
  },
  /** Non-void pours still taking a mould at or after `from`. */
  pours(db: Knex, workshopId: number, from: Date) {
    return db('pours').select('mould_id', 'caster_id', 'mix_at', db.raw('lower(slot) AS slot_start'), db.raw('upper(slot) AS slot_end'))
      .where({ workshop_id: workshopId }).whereNot('state', 'void').whereRaw('upper(slot) > ?', [from.toISOString()])
  },
  shopDays(db: Knex, workshopId: number, fromDay: string) {
    return db('shop_days').select('day', 'temp_c').where({ workshop_id: workshopId }).where('day', '>=', fromDay)
  },
  /** Benches with a limit on mixes gauged at once. */
  benchLimits(db: Knex, workshopId: number): Promise<{ id: number; max_mixes: number }[]> {
    return db('benches').select('id', 'max_mixes').where({ workshop_id: workshopId }).whereNotNull('max_mixes')
  },
  casters(db: Knex, workshopId: number) {
    return db('users').select('id').where({ workshop_id: workshopId, role: 'caster' }).whereNull('disabled_at').orderBy('id')
  },
}
