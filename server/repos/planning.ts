// The planner's reads: everything planPours needs about a workshop, each in its workshop.
import type { Knex } from 'knex'
import { DEPOSIT_RELEASED } from './payments'

/**
 * A pour that counts towards its item (SQL on a pour aliased `p`): not void, and not one whose
 * pieces were all rejected in finishing. A rejected piece so returns its item's count to the
 * planner, which plans another cast; a piece in repair still counts until it is rejected.
 */
export const COUNTED_POUR = `p.state <> 'void' AND (NOT EXISTS (SELECT 1 FROM pieces pc WHERE pc.pour_id = p.id AND pc.workshop_id = p.workshop_id)
  OR EXISTS (SELECT 1 FROM pieces ok WHERE ok.pour_id = p.id AND ok.workshop_id = p.workshop_id AND ok.state <> 'rejected'))`

/**
 * Pieces an item's pours count (SQL on a job item aliased `i`, an integer): a pour not yet
 * demoulded counts its mould's cavities (one pour fills them all), a demoulded one its pieces
 * not rejected. Void pours count nothing.
 */
export const COUNTED_PIECES = `(SELECT coalesce(sum(CASE
    WHEN EXISTS (SELECT 1 FROM pieces pc WHERE pc.pour_id = p.id AND pc.workshop_id = p.workshop_id)
    THEN (SELECT count(*) FROM pieces ok WHERE ok.pour_id = p.id AND ok.workshop_id = p.workshop_id AND ok.state <> 'rejected')
    ELSE m.cavities END), 0)::int
  FROM pours p JOIN moulds m ON m.id = p.mould_id AND m.workshop_id = p.workshop_id
  WHERE p.workshop_id = i.workshop_id AND p.job_item_id = i.id AND p.state <> 'void')`

export const planningRepo = {
  moulds(db: Knex, workshopId: number) {
    return db('moulds').select('id', 'code', 'bench_id', 'state', 'prep_minutes', 'clean_minutes', 'max_dwell_minutes', 'pulls', 'expected_pulls', 'profile_id', 'cavity_litres',
      'cavities', 'cast_type', 'surface_area_m2', 'shell_thickness_mm')
      .where({ workshop_id: workshopId }).orderBy('code')
  },
  /**
   * Items of open jobs with the pieces still to plan: needed less the item's counted pieces
   * (COUNTED_PIECES: a pour's cavities until demoulded, then its pieces not rejected).
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
      .select(db.raw(`${COUNTED_PIECES} AS pieces_counted`))
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
