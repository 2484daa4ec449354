// Every knex call for plaster_grades. A grade row holds the PlasterGrade fields plus the
// shop's bag mass and the calibration the register fills in from recorded demoulds.
import type { Knex } from 'knex'
import type { PlasterGrade } from '#shared/utils/plaster-core'
import { UNIQUE_LABELS, updateVersioned } from './versioned'

/** A plaster_grades row as GRADE_COLUMNS read it (NUMERIC and INT8 come back as numbers, see server/utils/db.ts). */
export interface GradeRow {
  id: number
  name: string
  preset_key: string | null
  form: 'beta' | 'alpha'
  powder_density: number
  consistency_min: number
  consistency_max: number
  consistency_default: number
  demould_minutes_ref: number
  set_time_water_exponent: number
  temperature_factors: [number, number][]
  hydration_heat: number
  set_expansion_pct: number
  purity: number
  bag_kg: number
  calibration_factor: number | null
  calibration_count: number
  calibration_applied: boolean
  calibration_applied_factor: number | null
  calibration_applied_count: number
  calibration_applied_at: Date | null
  calibration_excluded: number
  notes: string | null
  archived_at: Date | null
  version: number
  updated_at: Date
}

export const GRADE_COLUMNS = ['id', 'name', 'preset_key', 'form', 'powder_density', 'consistency_min', 'consistency_max',
  'consistency_default', 'demould_minutes_ref', 'set_time_water_exponent', 'temperature_factors', 'hydration_heat',
  'set_expansion_pct', 'purity', 'bag_kg', 'calibration_factor', 'calibration_count', 'calibration_applied', 'calibration_applied_factor',
  'calibration_applied_count', 'calibration_applied_at', 'calibration_excluded', 'notes',
  'archived_at', 'version', 'updated_at'] as const

function gradeColumns(g: PlasterGrade) {
  return {
    form: g.form, powder_density: g.powderDensity, consistency_min: g.consistency.min, consistency_max: g.consistency.max,
    consistency_default: g.consistency.default, demould_minutes_ref: g.demouldMinutesRef,
    set_time_water_exponent: g.setTimeWaterExponent, temperature_factors: JSON.stringify(g.temperatureFactors),
    hydration_heat: g.hydrationHeat, set_expansion_pct: g.setExpansionPct, purity: g.purity,
  }
}

export interface GradeInput { name?: string; presetKey?: string | null; bagKg?: number; notes?: string | null; grade?: PlasterGrade; archived?: boolean }

function toColumns(input: GradeInput, db: Knex) {
  return {
    ...(input.name !== undefined && { name: input.name }),
    ...(input.presetKey !== undefined && { preset_key: input.presetKey }),
    ...(input.bagKg !== undefined && { bag_kg: input.bagKg }),
    ...(input.notes !== undefined && { notes: input.notes }),
    ...(input.grade && gradeColumns(input.grade)),
    ...(input.archived !== undefined && { archived_at: input.archived ? db.fn.now() : null }),
  }
}

export const gradesRepo = {
  list(db: Knex, workshopId: number): Promise<GradeRow[]> {
    return db('plaster_grades').select(GRADE_COLUMNS).where({ workshop_id: workshopId })
      .orderByRaw('archived_at IS NOT NULL, name')
  },
  /** Many grades at once (an import). */
  async insertMany(db: Knex, workshopId: number, rows: GradeInput[]) {
    for (let i = 0; i < rows.length; i += 500) await db('plaster_grades').insert(rows.slice(i, i + 500).map(r => ({ workshop_id: workshopId, ...toColumns(r, db) })))
  },
  byId(db: Knex, workshopId: number, id: number): Promise<GradeRow | undefined> {
    return db('plaster_grades').first(GRADE_COLUMNS).where({ workshop_id: workshopId, id })
  },
  async insert(db: Knex, workshopId: number, input: GradeInput): Promise<GradeRow> {
    try {
      const [row] = await db('plaster_grades').insert({ workshop_id: workshopId, ...toColumns(input, db) }).returning(GRADE_COLUMNS)
      return row
    }
    catch (err) {
      rethrowDbError(err, UNIQUE_LABELS)
    }
  },
  update(db: Knex, workshopId: number, id: number, version: number, input: GradeInput): Promise<GradeRow> {
    return updateVersioned<GradeRow>(db, 'plaster_grades', { workshopId, id, version }, toColumns(input, db), GRADE_COLUMNS, 'Plaster grade')
  },
}

/** The grade's demould calibration, which each demoulded pour moves on (plaster-set.ts calibrationFromPours). */
export const gradeCalibrationRepo = {
  async set(db: Knex, workshopId: number, gradeId: number, factor: number, count: number, excluded = 0) {
    await db('plaster_grades').where({ workshop_id: workshopId, id: gradeId })
      .update({ calibration_factor: count ? factor : null, calibration_count: count, calibration_excluded: excluded, updated_at: db.fn.now() })
  },
  /**
   * A lead applies the live factor (or withdraws it): the applied factor and its count are
   * copied so later demoulds do not move what the board plans with until the lead applies again.
   * Versioned like any edit of the grade.
   */
  apply(db: Knex, workshopId: number, id: number, version: number, apply: boolean): Promise<GradeRow> {
    const patch = apply
      ? { calibration_applied: true, calibration_applied_factor: db.ref('calibration_factor'), calibration_applied_count: db.ref('calibration_count'), calibration_applied_at: db.fn.now() }
      : { calibration_applied: false, calibration_applied_factor: null, calibration_applied_count: 0, calibration_applied_at: null }
    return updateVersioned<GradeRow>(db, 'plaster_grades', { workshopId, id, version }, patch, GRADE_COLUMNS, 'Plaster grade')
  },
}
