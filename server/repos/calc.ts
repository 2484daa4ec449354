// Reads for the mix card: the workshop's grades (as the plaster model wants them), its
// moulds' cavities and dwell, and its display units.
import type { Knex } from 'knex'

const GRADE_COLUMNS = ['id', 'name', 'form', 'powder_density', 'consistency_min', 'consistency_max', 'consistency_default',
  'demould_minutes_ref', 'set_time_water_exponent', 'temperature_factors', 'hydration_heat', 'set_expansion_pct', 'purity',
  'bag_kg', 'calibration_factor', 'calibration_count', 'calibration_applied']

export const calcRepo = {
  grades(db: Knex, workshopId: number) {
    return db('plaster_grades').select(GRADE_COLUMNS).where({ workshop_id: workshopId }).whereNull('archived_at').orderBy('name')
  },
  grade(db: Knex, workshopId: number, id: number) {
    return db('plaster_grades').first(GRADE_COLUMNS).where({ workshop_id: workshopId, id })
  },
  moulds(db: Knex, workshopId: number) {
    return db('moulds').select('id', 'code', 'casts', 'cavity_litres', 'max_dwell_minutes', 'state')
      .where({ workshop_id: workshopId }).whereNot('state', 'retired').orderBy('code')
  },
  mould(db: Knex, workshopId: number, id: number) {
    return db('moulds').first('id', 'code', 'cavity_litres', 'max_dwell_minutes').where({ workshop_id: workshopId, id })
  },
  workshop(db: Knex, workshopId: number) {
    return db('workshops').first('units', 'default_shop_temp_c').where({ id: workshopId })
  },
}
