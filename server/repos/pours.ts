// Every knex call for pours (and the facts about moulds, items, casters and lots that a
// pour's rules need). Workshop in every WHERE; ids from PostgreSQL bigints arrive as numbers.
import type { Knex } from 'knex'
import type { PourState } from '#shared/types/board'
import { recordEvent } from './events'
import type { CalibrationPour } from '#shared/utils/plaster-set'

export interface PourDtoRow {
  id: number
  version: number
  mould_id: number
  mould_code: string
  bench_id: number | null
  bench_name: string | null
  casts: string
  job_item_id: number | null
  job_id: number | null
  job_code: string | null
  item_description: string | null
  caster_id: number | null
  caster_name: string | null
  grade_id: number
  grade_name: string
  lot_id: number | null
  state: PourState
  is_sample: boolean
  consistency: number
  set_factor: number
  slot_start: Date
  slot_end: Date
  mix_at: Date
  demould_open_at: Date
  demould_close_at: Date
  plaster_kg_planned: number
  water_kg_planned: number
  warnings: string[]
  /** the workshop's zone, for the clock times in a missed start's words */
  timezone: string
  /** the workshop's units, for the figures in the stored (metric) warnings */
  units: 'metric' | 'imperial'
  /** the workshop's locale, for the day style of those times */
  locale: string
}

/** A pour's row as its floor steps read and write it (locked), with its actuals. */
export interface PourStepRow {
  id: number
  version: number
  state: PourState
  mould_id: number
  job_item_id: number | null
  grade_id: number
  lot_id: number | null
  consistency: number
  set_factor: number
  plaster_kg_planned: number
  water_kg_planned: number
  plaster_kg_actual: number | null
  water_kg_actual: number | null
  water_temp_c: number | null
  powder_temp_c: number | null
  shop_temp_c: number | null
  slurry_temp_c: number | null
  mixing_at: Date | null
  poured_at: Date | null
  demoulded_at: Date | null
  predicted_demould_minutes: number | null
  demould_open_at: Date
  demould_close_at: Date
}

const STEP_COLUMNS = ['id', 'version', 'state', 'mould_id', 'job_item_id', 'grade_id', 'lot_id', 'consistency', 'set_factor',
  'plaster_kg_planned', 'water_kg_planned', 'plaster_kg_actual', 'water_kg_actual', 'water_temp_c', 'powder_temp_c', 'shop_temp_c',
  'slurry_temp_c', 'mixing_at', 'poured_at', 'demoulded_at', 'predicted_demould_minutes', 'demould_open_at', 'demould_close_at'] as const

/** The PourDto's columns; one query, so the board is a single read of pours. */
const DTO_SQL = `SELECT p.id, p.version, p.mould_id, m.code AS mould_code, m.bench_id, b.name AS bench_name, m.casts,
    p.job_item_id, i.job_id, j.code AS job_code, i.description AS item_description,
    p.caster_id, u.name AS caster_name, p.grade_id, g.name AS grade_name, p.lot_id, p.state, p.is_sample,
    p.consistency, p.set_factor, lower(p.slot) AS slot_start, upper(p.slot) AS slot_end, p.mix_at,
    p.demould_open_at, p.demould_close_at, p.plaster_kg_planned, p.water_kg_planned, p.warnings, ws.timezone, ws.units, ws.locale
  FROM pours p
  JOIN workshops ws ON ws.id = p.workshop_id
  JOIN moulds m ON m.id = p.mould_id AND m.workshop_id = p.workshop_id
  LEFT JOIN benches b ON b.id = m.bench_id AND b.workshop_id = p.workshop_id
  JOIN plaster_grades g ON g.id = p.grade_id AND g.workshop_id = p.workshop_id
  LEFT JOIN job_items i ON i.id = p.job_item_id AND i.workshop_id = p.workshop_id
  LEFT JOIN jobs j ON j.id = i.job_id AND j.workshop_id = p.workshop_id
  LEFT JOIN users u ON u.id = p.caster_id AND u.workshop_id = p.workshop_id
  WHERE p.workshop_id = :workshopId`

/** tstzrange of the local days from..to (inclusive) in the workshop's zone. */
const DAYS_RANGE = `tstzrange((:from::date)::timestamp AT TIME ZONE w.timezone, ((:to::date) + 1)::timestamp AT TIME ZONE w.timezone)`

export interface PourWrite {
  job_item_id: number | null
  mould_id: number
  caster_id: number | null
  grade_id: number
  lot_id: number | null
  is_sample: boolean
  consistency: number
  set_factor: number
  slotStart: Date
  slotEnd: Date
  mix_at: Date
  demould_open_at: Date
  demould_close_at: Date
  plaster_kg_planned: number
  water_kg_planned: number
  warnings: string[]
}

function columns(db: Knex, w: PourWrite) {
  const { slotStart, slotEnd, warnings, ...rest } = w
  return { ...rest, slot: db.raw('tstzrange(?, ?)', [slotStart.toISOString(), slotEnd.toISOString()]), warnings: JSON.stringify(warnings) }
}

export const poursRepo = {
  async dto(db: Knex, workshopId: number, id: number): Promise<PourDtoRow | undefined> {
    const r = await db.raw(`${DTO_SQL} AND p.id = :id`, { workshopId, id })
    return r.rows[0]
  },
  /** Several pours in one query, in no particular order (missing or another workshop's ids are left out). */
  async dtos(db: Knex, workshopId: number, ids: number[]): Promise<PourDtoRow[]> {
    if (!ids.length) return []
    const r = await db.raw(`${DTO_SQL} AND p.id = ANY(:ids::bigint[])`, { workshopId, ids })
    return r.rows
  },
  /** Non-void pours whose slot overlaps the local days from..to, in slot order. */
  async inDays(db: Knex, workshopId: number, from: string, to: string): Promise<PourDtoRow[]> {
    const r = await db.raw(`${DTO_SQL} AND p.state <> 'void'
      AND p.slot && (SELECT ${DAYS_RANGE} FROM workshops w WHERE w.id = :workshopId)
      ORDER BY lower(p.slot), p.id`, { workshopId, from, to })
    return r.rows
  },
  /** Non-void pours whose prep starts on the local day (the day sheet's and shop day's pours). */
  async startingOn(db: Knex, workshopId: number, day: string, states?: string[]): Promise<PourDtoRow[]> {
    const r = await db.raw(`${DTO_SQL} AND p.state <> 'void'
      AND lower(p.slot) <@ (SELECT ${DAYS_RANGE} FROM workshops w WHERE w.id = :workshopId)
      ${states ? 'AND p.state = ANY(:states)' : ''}
      ORDER BY lower(p.slot), p.id`, { workshopId, from: day, to: day, ...(states ? { states } : {}) })
    return r.rows
  },
  /**
   * Locks mould rows (in id order) until the transaction ends, so bookings of one mould run
   * one after another: without it two concurrent inserts can each wait on the other's row
   * while PostgreSQL checks the exclusion constraint, and one dies of a deadlock.
   */
  async lockMoulds(db: Knex, workshopId: number, ids: number[]) {
    const unique = [...new Set(ids)].sort((a, b) => a - b)
    if (unique.length) await db('moulds').select('id').where({ workshop_id: workshopId }).whereIn('id', unique).orderBy('id').forUpdate()
  },
  /** The pour row for a change, locked until the transaction ends. */
  forUpdate(db: Knex, workshopId: number, id: number) {
    return db('pours').first('id', 'version', 'state', 'job_item_id', 'mould_id', 'caster_id', 'grade_id', 'lot_id', 'is_sample',
      'consistency', 'set_factor', db.raw('lower(slot) AS slot_start'))
      .where({ workshop_id: workshopId, id }).forUpdate()
  },
  /** The first non-void pour on the mould whose slot overlaps start..end (other than `exceptId`). */
  clash(db: Knex, workshopId: number, mouldId: number, start: Date, end: Date, exceptId?: number) {
    const q = db('pours as p').leftJoin('job_items as i', 'i.id', 'p.job_item_id').leftJoin('jobs as j', 'j.id', 'i.job_id')
      .join('moulds as m', function () {
        this.on('m.id', 'p.mould_id').andOn('m.workshop_id', 'p.workshop_id')
      })
      .first('p.id', db.raw('lower(p.slot) AS slot_start'), db.raw('upper(p.slot) AS slot_end'), 'j.code as job_code', 'm.code as mould_code', 'p.mix_at')
      .where({ 'p.workshop_id': workshopId, 'p.mould_id': mouldId }).whereNot('p.state', 'void')
      .whereRaw('p.slot && tstzrange(?, ?)', [start.toISOString(), end.toISOString()]).orderByRaw('lower(p.slot)')
    if (exceptId) q.whereNot('p.id', exceptId)
    return q
  },
  /** The start of the next non-void pour on the mould at or after `after` (other than `exceptId`). */
  async nextStart(db: Knex, workshopId: number, mouldId: number, after: Date, exceptId: number): Promise<Date | null> {
    const r = await db('pours').first(db.raw('min(lower(slot)) AS start'))
      .where({ workshop_id: workshopId, mould_id: mouldId }).whereNot('state', 'void').whereNot('id', exceptId)
      .whereRaw('lower(slot) >= ?', [after.toISOString()])
    return r?.start ?? null
  },
  /** Other non-void pours of a caster gauging within a day of `mixAt` (the rule then checks the overlap). */
  casterMixesNear(db: Knex, workshopId: number, casterId: number, mixAt: Date, exceptId?: number) {
    const q = db('pours as p').join('moulds as m', 'm.id', 'p.mould_id')
      .select('p.id', 'p.mix_at', 'm.code as mould_code')
      .where({ 'p.workshop_id': workshopId, 'p.caster_id': casterId }).whereNot('p.state', 'void')
      .whereRaw('p.mix_at BETWEEN ?::timestamptz - interval \'1 day\' AND ?::timestamptz + interval \'1 day\'', [mixAt.toISOString(), mixAt.toISOString()])
    if (exceptId) q.whereNot('p.id', exceptId)
    return q
  },
  /** Non-void pours on the mould not yet demoulded (pulls already count the demoulded ones). */
  async openOnMould(db: Knex, workshopId: number, mouldId: number, exceptId?: number): Promise<number> {
    const q = db('pours').first(db.raw('count(*)::int AS n')).where({ workshop_id: workshopId, mould_id: mouldId })
      .whereIn('state', ['planned', 'mixing', 'setting'])
    if (exceptId) q.whereNot('id', exceptId)
    return (await q).n
  },
  /** kg of plaster taken from a lot by its non-void pours (actual weight where recorded). */
  async lotUsedKg(db: Knex, workshopId: number, lotId: number, exceptId?: number): Promise<number> {
    const q = db('pours').first(db.raw('coalesce(sum(coalesce(plaster_kg_actual, plaster_kg_planned)), 0)::float8 AS kg'))
      .where({ workshop_id: workshopId, lot_id: lotId }).whereNot('state', 'void')
    if (exceptId) q.whereNot('id', exceptId)
    return Number((await q).kg)
  },
  async insert(db: Knex, workshopId: number, createdBy: number, w: PourWrite): Promise<number> {
    const [row] = await db('pours').insert({ workshop_id: workshopId, created_by: createdBy, ...columns(db, w) }).returning('id')
    return Number(row.id)
  },
  /** Writes a planned pour's new plan when its version still matches; false when it moved on. */
  async replan(db: Knex, workshopId: number, id: number, version: number, w: PourWrite): Promise<boolean> {
    const n = await db('pours').where({ workshop_id: workshopId, id, version })
      .update({ ...columns(db, w), version: db.raw('version + 1'), updated_at: db.fn.now() })
    return n === 1
  },
  async voidPour(db: Knex, workshopId: number, id: number, version: number, reason: string): Promise<boolean> {
    const n = await db('pours').where({ workshop_id: workshopId, id, version, state: 'planned' })
      .update({ state: 'void', void_reason: reason, version: db.raw('version + 1'), updated_at: db.fn.now() })
    return n === 1
  },
  event(db: Knex, e: { workshopId: number; pourId: number; type: string; actorId: number; data: Record<string, unknown> }) {
    return recordEvent(db, { workshopId: e.workshopId, entity: 'pour', entityId: e.pourId, type: e.type, actorId: e.actorId, data: e.data })
  },
  /** The pour row for a floor step, with its actuals, locked until the transaction ends. */
  forStep(db: Knex, workshopId: number, id: number): Promise<PourStepRow | undefined> {
    return db('pours').first(...STEP_COLUMNS).where({ workshop_id: workshopId, id }).forUpdate()
  },
  /** Writes one floor step when the version still matches; false when someone else moved it on. */
  async step(db: Knex, workshopId: number, id: number, version: number, patch: Record<string, unknown>): Promise<boolean> {
    const n = await db('pours').where({ workshop_id: workshopId, id, version })
      .update({ ...patch, version: db.raw('version + 1'), updated_at: db.fn.now() })
    return n === 1
  },
  /** The grade's demoulded pours with the times calibration reads, in register order, oldest first. */
  async calibrationPours(db: Knex, workshopId: number, gradeId: number): Promise<Omit<CalibrationPour, 'mixMinutes'>[]> {
    const rows = await db('pours').select('mixing_at', 'demould_open_at', 'demould_close_at', 'demoulded_at', 'predicted_demould_minutes')
      .where({ workshop_id: workshopId, grade_id: gradeId }).whereNotNull('demoulded_at').whereNotNull('predicted_demould_minutes')
      .orderBy([{ column: 'demoulded_at' }, { column: 'id' }])
    return rows.map(r => ({
      mixingAt: r.mixing_at, demouldOpenAt: r.demould_open_at, demouldCloseAt: r.demould_close_at, demouldedAt: r.demoulded_at,
      predictedMinutes: Number(r.predicted_demould_minutes),
    }))
  },
}

/** The facts a pour's rules read about the things it names, each in the caller's workshop. */
export const pourFactsRepo = {
  mould(db: Knex, workshopId: number, id: number) {
    return db('moulds').first('id', 'code', 'state', 'cavity_litres', 'prep_minutes', 'clean_minutes', 'max_dwell_minutes', 'pulls', 'expected_pulls',
      'cavities', 'cast_type', 'surface_area_m2', 'shell_thickness_mm')
      .where({ workshop_id: workshopId, id })
  },
  item(db: Knex, workshopId: number, id: number) {
    return db('job_items as i').join('jobs as j', 'j.id', 'i.job_id')
      .first('i.id', 'i.job_id', 'i.grade_id', 'i.consistency', 'j.code as job_code', 'j.sample_required', 'j.sample_state')
      .where({ 'i.workshop_id': workshopId, 'i.id': id })
  },
  caster(db: Knex, workshopId: number, id: number) {
    return db('users').first('id', 'name').where({ workshop_id: workshopId, id }).whereIn('role', ['lead', 'caster']).whereNull('disabled_at')
  },
  grade(db: Knex, workshopId: number, id?: number | null) {
    const q = db('plaster_grades').first().where({ workshop_id: workshopId })
    return id ? q.where({ id }) : q.whereNull('archived_at').orderBy('id')
  },
  lot(db: Knex, workshopId: number, id: number) {
    return db('plaster_lots').first('id', 'lot_code', 'bags_received', 'bag_kg', 'grade_id').where({ workshop_id: workshopId, id })
  },
}

/** The day sheet's reads: bench order, and each lot of the given grades with its stock left. */
export const daySheetRepo = {
  benches(db: Knex, workshopId: number) {
    return db('benches').select('id', 'name', 'sort_order').where({ workshop_id: workshopId }).orderBy(['sort_order', 'name'])
  },
  grades(db: Knex, workshopId: number, ids: number[]) {
    return db('plaster_grades').select('id', 'name', 'bag_kg').where({ workshop_id: workshopId }).whereIn('id', ids)
  },
  lots(db: Knex, workshopId: number, gradeIds: number[]) {
    return db('plaster_lots as l').select('l.id', 'l.grade_id', 'l.lot_code', 'l.received_on', 'l.use_by', 'l.bags_received', 'l.bag_kg')
      .select(db.raw(`to_char(l.use_by, 'YYYY-MM-DD') AS use_by_day, to_char(l.received_on, 'YYYY-MM-DD') AS received_day`))
      .select(db.raw(`(SELECT coalesce(sum(coalesce(p.plaster_kg_actual, p.plaster_kg_planned)), 0)::float8 FROM pours p
        WHERE p.workshop_id = l.workshop_id AND p.lot_id = l.id AND p.state <> 'void') AS used_kg`))
      .where({ 'l.workshop_id': workshopId }).whereIn('l.grade_id', gradeIds).whereNull('l.archived_at')
  },
}
