// The counts behind a client's progress view: per item, pours planned (not void) and pieces
// by how far they have come. Only counts and the item's own description leave this module.
// A rejected piece drops out of "planned" and "cast" (its replacement is planned and cast in
// its place), so the counts never pass what was ordered because of a bad cast, and the client
// is not shown that anything was rejected.
import type { Knex } from 'knex'
import { COUNTED_PIECES, COUNTED_POUR } from './planning'

/** Per item, the counts the client's page shows (shared/types/photos.ts ItemProgressDto). */
export interface ItemProgressRow { id: number; description: string; pieces_needed: number; planned: number; cast: number; fettled: number; dry: number; dispatched: number }

const FETTLED = ['drying', 'ready', 'packed', 'dispatched']
const DRY = ['ready', 'packed', 'dispatched']

export const progressRepo = {
  items(db: Knex, workshopId: number, jobId: number): Promise<ItemProgressRow[]> {
    const inList = (states: string[]) => states.map(() => '?').join(', ')
    return db('job_items as i').where({ 'i.workshop_id': workshopId, 'i.job_id': jobId })
      .select('i.id', 'i.description', 'i.pieces_needed')
      .select(db.raw(`${COUNTED_PIECES} AS planned`))
      .select(db.raw(`(SELECT count(*)::int FROM pieces c WHERE c.job_item_id = i.id AND c.workshop_id = i.workshop_id AND c.state <> 'rejected') AS cast`))
      .select(db.raw(`(SELECT count(*)::int FROM pieces c WHERE c.job_item_id = i.id AND c.workshop_id = i.workshop_id AND c.state IN (${inList(FETTLED)})) AS fettled`, FETTLED))
      .select(db.raw(`(SELECT count(*)::int FROM pieces c WHERE c.job_item_id = i.id AND c.workshop_id = i.workshop_id AND c.state IN (${inList(DRY)})) AS dry`, DRY))
      .select(db.raw(`(SELECT count(*)::int FROM pieces c WHERE c.job_item_id = i.id AND c.workshop_id = i.workshop_id AND c.state = 'dispatched') AS dispatched`))
      .orderBy([{ column: 'i.sort_order' }, { column: 'i.id' }])
  },
  /**
   * The job's counted casts (non-void pours whose piece was not rejected) with what their ready
   * time needs: the piece if demoulded, the planned batch, the mould's cavity and the grade.
   */
  casts(db: Knex, workshopId: number, jobId: number) {
    return db('pours as p')
      .join('job_items as i', function () {
        this.on('i.id', 'p.job_item_id').andOn('i.workshop_id', 'p.workshop_id')
      })
      .join('moulds as m', function () {
        this.on('m.id', 'p.mould_id').andOn('m.workshop_id', 'p.workshop_id')
      })
      .join('plaster_grades as g', function () {
        this.on('g.id', 'p.grade_id').andOn('g.workshop_id', 'p.workshop_id')
      })
      // one row per piece once demoulded (a multi-cavity pour makes several), the rejected left out
      .leftJoin('pieces as c', function () {
        this.on('c.pour_id', 'p.id').andOn('c.workshop_id', 'p.workshop_id')
      })
      .where({ 'p.workshop_id': workshopId, 'i.job_id': jobId })
      .whereRaw(COUNTED_POUR)
      .where(q => q.whereNull('c.id').orWhereNot('c.state', 'rejected'))
      .select('p.demould_open_at', 'p.demoulded_at', 'p.plaster_kg_planned', 'p.water_kg_planned', 'p.plaster_kg_actual', 'p.water_kg_actual',
        'm.cavity_litres', 'm.cavities', 'm.cast_type', 'm.shell_thickness_mm', 'c.state as piece_state', 'c.dry_by', 'c.wet_mass_kg', 'c.dry_mass_kg', 'g.form', 'g.powder_density',
        'g.consistency_min', 'g.consistency_max', 'g.consistency_default', 'g.demould_minutes_ref', 'g.set_time_water_exponent',
        'g.temperature_factors', 'g.hydration_heat', 'g.set_expansion_pct', 'g.purity')
  },
  /** The latest demould opening of the job's pours that are not void: when the last cast can come out. */
  async expectedCompletion(db: Knex, workshopId: number, jobId: number): Promise<Date | null> {
    const row = await db('pours as p').join('job_items as i', function () {
      this.on('i.id', 'p.job_item_id').andOn('i.workshop_id', 'p.workshop_id')
    }).where({ 'p.workshop_id': workshopId, 'i.job_id': jobId }).whereNot('p.state', 'void')
      .max({ at: 'p.demould_open_at' }).first()
    return (row?.at as Date | null) ?? null
  },
}
