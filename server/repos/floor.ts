// Every knex call the floor's pour actions make beyond the board's reads (server/repos/pours.ts):
// the pour row with its actuals, the step writes, the piece, the mould's pull and the grade's
// calibration. Workshop in every WHERE.
import type { Knex } from 'knex'

export interface FloorPourRow {
  id: number
  version: number
  state: 'planned' | 'mixing' | 'setting' | 'demoulded' | 'void'
  mould_id: number
  job_item_id: number | null
  grade_id: number
  lot_id: number | null
  consistency: string
  set_factor: string
  plaster_kg_planned: string
  water_kg_planned: string
  plaster_kg_actual: string | null
  water_kg_actual: string | null
  water_temp_c: string | null
  powder_temp_c: string | null
  shop_temp_c: string | null
  slurry_temp_c: string | null
  mixing_at: Date | null
  poured_at: Date | null
  demoulded_at: Date | null
  predicted_demould_minutes: string | null
}

const ACTUAL_COLUMNS = ['id', 'version', 'state', 'mould_id', 'job_item_id', 'grade_id', 'lot_id', 'consistency', 'set_factor',
  'plaster_kg_planned', 'water_kg_planned', 'plaster_kg_actual', 'water_kg_actual', 'water_temp_c', 'powder_temp_c', 'shop_temp_c',
  'slurry_temp_c', 'mixing_at', 'poured_at', 'demoulded_at', 'predicted_demould_minutes'] as const

export interface FloorActualsRow {
  id: number
  mixing_at: Date | null
  poured_at: Date | null
  demoulded_at: Date | null
  backdated: boolean
  plaster_kg_actual: string | null
  water_kg_actual: string | null
  water_temp_c: string | null
  powder_temp_c: string | null
  shop_temp_c: string | null
  slurry_temp_c: string | null
  result: 'sound' | 'defect' | null
  defect: string | null
  lot_code: string | null
  piece_mark: string | null
  piece_id: string | null
  cavity_litres: string
  mould_state: string
}

export const floorRepo = {
  forUpdate(db: Knex, workshopId: number, id: number): Promise<FloorPourRow | undefined> {
    return db('pours').first(...ACTUAL_COLUMNS).where({ workshop_id: workshopId, id }).forUpdate()
  },
  /** Writes one step when the version still matches; false when someone else moved it on. */
  async step(db: Knex, workshopId: number, id: number, version: number, patch: Record<string, unknown>): Promise<boolean> {
    const n = await db('pours').where({ workshop_id: workshopId, id, version })
      .update({ ...patch, version: db.raw('version + 1'), updated_at: db.fn.now() })
    return n === 1
  },
  mould(db: Knex, workshopId: number, id: number) {
    return db('moulds').first('id', 'code', 'state', 'pulls', 'cavity_litres', 'max_dwell_minutes', 'prep_minutes', 'clean_minutes', 'version')
      .where({ workshop_id: workshopId, id }).forUpdate()
  },
  /** Moves the mould's state (and optionally counts a pull), bumping its version. */
  async mouldState(db: Knex, workshopId: number, id: number, state: string, actorId: number, pull = false) {
    await db('moulds').where({ workshop_id: workshopId, id }).update({
      state, state_changed_by: actorId, state_changed_at: db.fn.now(), version: db.raw('version + 1'), updated_at: db.fn.now(),
      ...(pull ? { pulls: db.raw('pulls + 1') } : {}),
    })
  },
  jobCode(db: Knex, workshopId: number, itemId: number | null) {
    if (!itemId) return Promise.resolve(undefined)
    return db('job_items as i').join('jobs as j', 'j.id', 'i.job_id').first('j.code').where({ 'i.workshop_id': workshopId, 'i.id': itemId })
  },
  async markTaken(db: Knex, workshopId: number, mark: string): Promise<boolean> {
    return !!(await db('pieces').first('id').where({ workshop_id: workshopId, mark }))
  },
  async insertPiece(db: Knex, workshopId: number, p: { pourId: number; jobItemId: number | null; mark: string; dryMassKg: number; wetMassKg: number; state: string }) {
    const [row] = await db('pieces').insert({
      workshop_id: workshopId, pour_id: p.pourId, job_item_id: p.jobItemId, mark: p.mark, state: p.state,
      dry_mass_kg: p.dryMassKg, wet_mass_kg: p.wetMassKg,
    }).returning(['id', 'mark', 'state', 'dry_mass_kg', 'wet_mass_kg', 'version'])
    return { id: Number(row.id), mark: row.mark as string, state: row.state as string, dryMassKg: Number(row.dry_mass_kg), wetMassKg: Number(row.wet_mass_kg), version: row.version as number }
  },
  /** The grade's (predicted, actual) demould pairs in register order, oldest first. */
  async calibrationPairs(db: Knex, workshopId: number, gradeId: number) {
    const rows = await db('pours').select('predicted_demould_minutes', 'actual_demould_minutes')
      .where({ workshop_id: workshopId, grade_id: gradeId }).whereNotNull('actual_demould_minutes').whereNotNull('predicted_demould_minutes')
      .orderBy([{ column: 'demoulded_at' }, { column: 'id' }])
    return rows.map(r => ({ predictedMinutes: Number(r.predicted_demould_minutes), actualMinutes: Number(r.actual_demould_minutes) }))
  },
  async setCalibration(db: Knex, workshopId: number, gradeId: number, factor: number, count: number) {
    await db('plaster_grades').where({ workshop_id: workshopId, id: gradeId })
      .update({ calibration_factor: factor, calibration_count: count, updated_at: db.fn.now() })
  },
  lot(db: Knex, workshopId: number, id: number) {
    return db('plaster_lots').first('id', 'grade_id', 'lot_code').where({ workshop_id: workshopId, id })
  },
  event(db: Knex, e: { workshopId: number; entity: string; entityId: number; type: string; actorId: number; at: Date; backdated: boolean; data: Record<string, unknown> }) {
    return db('events').insert({
      workshop_id: e.workshopId, entity: e.entity, entity_id: String(e.entityId), type: e.type, actor_id: e.actorId,
      at: e.at.toISOString(), backdated: e.backdated, data: JSON.stringify(e.data),
    })
  },
  /** Pours still mixing or setting whose prep started before the local day (a cast left overnight). */
  async openBefore(db: Knex, workshopId: number, day: string): Promise<number[]> {
    const r = await db.raw(`SELECT p.id FROM pours p JOIN workshops w ON w.id = p.workshop_id
      WHERE p.workshop_id = ? AND p.state IN ('mixing', 'setting') AND lower(p.slot) < (?::date)::timestamp AT TIME ZONE w.timezone
      ORDER BY lower(p.slot), p.id`, [workshopId, day])
    return r.rows.map((x: { id: string }) => Number(x.id))
  },
  /** The floor's extra facts for the given pours: actuals, lot, piece, the mould's cavity and state. */
  actuals(db: Knex, workshopId: number, ids: number[]): Promise<FloorActualsRow[]> {
    return db('pours as p').join('moulds as m', 'm.id', 'p.mould_id').leftJoin('plaster_lots as l', 'l.id', 'p.lot_id')
      .leftJoin('pieces as pc', 'pc.pour_id', 'p.id')
      .select('p.id', 'p.mixing_at', 'p.poured_at', 'p.demoulded_at', 'p.backdated', 'p.plaster_kg_actual', 'p.water_kg_actual',
        'p.water_temp_c', 'p.powder_temp_c', 'p.shop_temp_c', 'p.slurry_temp_c', 'p.result', 'p.defect', 'l.lot_code',
        'pc.mark as piece_mark', 'pc.id as piece_id', 'm.cavity_litres', 'm.state as mould_state')
      .where({ 'p.workshop_id': workshopId }).whereIn('p.id', ids)
  },
}
