// Every knex call for moulds, their pour history and their state-change events.
import type { Knex } from 'knex'
import { UNIQUE_LABELS, updateVersioned } from './versioned'

export const MOULD_COLUMNS = ['id', 'bench_id', 'code', 'casts', 'material', 'cavity_litres', 'cast_length_m', 'prep_minutes',
  'clean_minutes', 'max_dwell_minutes', 'pulls', 'expected_pulls', 'state', 'state_changed_by', 'state_changed_at',
  'state_reason', 'version', 'profile_id', 'cavities', 'cast_type', 'surface_area_m2', 'shell_thickness_mm'] as const

/** A moulds row as MOULD_COLUMNS read it (NUMERIC as a number: server/utils/db.ts). */
export interface MouldRow {
  id: number
  bench_id: number | null
  code: string
  casts: string
  material: string
  cavity_litres: number
  cast_length_m: number | null
  prep_minutes: number
  clean_minutes: number
  max_dwell_minutes: number
  pulls: number
  expected_pulls: number | null
  state: string
  state_changed_by: number | null
  state_changed_at: Date | null
  state_reason: string | null
  version: number
  profile_id: number | null
  cavities: number
  cast_type: 'solid' | 'fibrous'
  surface_area_m2: number | null
  shell_thickness_mm: number | null
}
/** A mould with its bench's name, its profile's name and the name of who last changed its state. */
export type MouldListRow = MouldRow & { bench_name: string | null; state_changed_by_name: string | null; profile_name: string | null }

export interface MouldPourRow {
  id: number
  state: string
  mix_at: Date
  demoulded_at: Date | null
  result: string | null
  defect: string | null
  is_sample: boolean
  consistency: number | null
  job_code: string | null
  item: string | null
  caster: string | null
  lot_code: string | null
}

export interface MouldEventRow {
  id: number
  type: string
  at: Date
  data: { from?: string; to?: string; reason?: string | null }
  actor: string | null
}

export interface MouldInput {
  code?: string
  casts?: string
  material?: string
  benchId?: number | null
  cavityLitres?: number
  castLengthM?: number | null
  prepMinutes?: number
  cleanMinutes?: number
  maxDwellMinutes?: number
  pulls?: number
  expectedPulls?: number | null
  profileId?: number | null
  cavities?: number
  castType?: 'solid' | 'fibrous'
  surfaceAreaM2?: number | null
  shellThicknessMm?: number | null
}

function toColumns(i: MouldInput) {
  const map: [keyof MouldInput, string][] = [['code', 'code'], ['casts', 'casts'], ['material', 'material'], ['benchId', 'bench_id'],
    ['cavityLitres', 'cavity_litres'], ['castLengthM', 'cast_length_m'], ['prepMinutes', 'prep_minutes'], ['cleanMinutes', 'clean_minutes'],
    ['maxDwellMinutes', 'max_dwell_minutes'], ['pulls', 'pulls'], ['expectedPulls', 'expected_pulls'], ['profileId', 'profile_id'],
    ['cavities', 'cavities'], ['castType', 'cast_type'], ['surfaceAreaM2', 'surface_area_m2'], ['shellThicknessMm', 'shell_thickness_mm']]
  return Object.fromEntries(map.filter(([k]) => i[k] !== undefined).map(([k, c]) => [c, i[k]]))
}

function listQuery(db: Knex, workshopId: number) {
  return db('moulds as m')
    .leftJoin('benches as b', function () {
      this.on('b.id', 'm.bench_id').andOn('b.workshop_id', 'm.workshop_id')
    })
    .leftJoin('users as u', function () {
      this.on('u.id', 'm.state_changed_by').andOn('u.workshop_id', 'm.workshop_id')
    })
    .leftJoin('profiles as pr', function () {
      this.on('pr.id', 'm.profile_id').andOn('pr.workshop_id', 'm.workshop_id')
    })
    .where('m.workshop_id', workshopId)
    .select(MOULD_COLUMNS.map(c => `m.${c}`)).select('b.name as bench_name', 'u.name as state_changed_by_name', 'pr.name as profile_name')
}

export const mouldsRepo = {
  list(db: Knex, workshopId: number): Promise<MouldListRow[]> {
    return listQuery(db, workshopId).orderBy('m.code')
  },
  byId(db: Knex, workshopId: number, id: number): Promise<MouldListRow | undefined> {
    return listQuery(db, workshopId).where('m.id', id).first()
  },
  /** The codes this workshop already uses (a CSV import refuses them; the unique index compares them exactly). */
  async codes(db: Knex, workshopId: number): Promise<Set<string>> {
    const rows: { code: string }[] = await db('moulds').select('code').where({ workshop_id: workshopId })
    return new Set(rows.map(r => r.code))
  },
  /** Every mould's id and cast length by code (an import names moulds by code). */
  async byCode(db: Knex, workshopId: number): Promise<Map<string, { id: number; cast_length_m: number | null }>> {
    const rows: { id: number; code: string; cast_length_m: number | null }[] = await db('moulds').select('id', 'code', 'cast_length_m').where({ workshop_id: workshopId })
    return new Map(rows.map(r => [r.code, { id: Number(r.id), cast_length_m: r.cast_length_m === null ? null : Number(r.cast_length_m) }]))
  },
  /** Pieces one pour makes, per mould id. */
  async cavities(db: Knex, workshopId: number, ids: number[]): Promise<Map<number, number>> {
    if (!ids.length) return new Map()
    const rows: { id: number; cavities: number }[] = await db('moulds').select('id', 'cavities').where({ workshop_id: workshopId }).whereIn('id', ids)
    return new Map(rows.map(r => [Number(r.id), Number(r.cavities)]))
  },
  /** Many moulds at once (CSV import, inside its transaction), with their state; in batches of 500 rows. */
  async insertMany(db: Knex, workshopId: number, actorId: number, rows: (MouldInput & { state: string; stateReason: string | null })[]) {
    const cols = rows.map(({ state, stateReason, ...input }) => ({
      workshop_id: workshopId, ...toColumns(input), state, state_reason: stateReason, state_changed_by: actorId, state_changed_at: db.fn.now(),
    }))
    for (let i = 0; i < cols.length; i += 500) await db('moulds').insert(cols.slice(i, i + 500))
  },
  async insert(db: Knex, workshopId: number, actorId: number, input: MouldInput): Promise<MouldRow> {
    try {
      const [row] = await db('moulds').insert({ workshop_id: workshopId, ...toColumns(input), state_changed_by: actorId, state_changed_at: db.fn.now() })
        .returning(MOULD_COLUMNS)
      return row
    }
    catch (err) {
      rethrowDbError(err, UNIQUE_LABELS)
    }
  },
  update(db: Knex, workshopId: number, id: number, version: number, input: MouldInput): Promise<MouldRow> {
    return updateVersioned<MouldRow>(db, 'moulds', { workshopId, id, version }, toColumns(input), MOULD_COLUMNS, 'Mould')
  },
  setState(db: Knex, workshopId: number, id: number, version: number, s: { state: string; reason: string | null; actorId: number }): Promise<MouldRow> {
    return updateVersioned<MouldRow>(db, 'moulds', { workshopId, id, version },
      { state: s.state, state_reason: s.reason, state_changed_by: s.actorId, state_changed_at: db.fn.now() }, MOULD_COLUMNS, 'Mould')
  },
  /** The mould's pours, newest first: job, item, caster, lot, result. */
  pours(db: Knex, workshopId: number, mouldId: number, limit = 100): Promise<MouldPourRow[]> {
    return db('pours as p')
      .leftJoin('job_items as i', function () {
        this.on('i.id', 'p.job_item_id').andOn('i.workshop_id', 'p.workshop_id')
      })
      .leftJoin('jobs as j', function () {
        this.on('j.id', 'i.job_id').andOn('j.workshop_id', 'i.workshop_id')
      })
      .leftJoin('users as c', function () {
        this.on('c.id', 'p.caster_id').andOn('c.workshop_id', 'p.workshop_id')
      })
      .leftJoin('plaster_lots as l', function () {
        this.on('l.id', 'p.lot_id').andOn('l.workshop_id', 'p.workshop_id')
      })
      .where({ 'p.workshop_id': workshopId, 'p.mould_id': mouldId })
      .select('p.id', 'p.state', 'p.mix_at', 'p.demoulded_at', 'p.result', 'p.defect', 'p.is_sample', 'p.consistency',
        'j.code as job_code', 'i.description as item', 'c.name as caster', 'l.lot_code')
      .orderBy('p.mix_at', 'desc').limit(limit)
  },
  /** State changes and other register entries about the mould, newest first. */
  events(db: Knex, workshopId: number, mouldId: number): Promise<MouldEventRow[]> {
    return db('events as e').leftJoin('users as u', 'u.id', 'e.actor_id')
      .where({ 'e.workshop_id': workshopId, 'e.entity': 'mould', 'e.entity_id': String(mouldId) })
      .select('e.id', 'e.type', 'e.at', 'e.data', 'u.name as actor').orderBy('e.at', 'desc').limit(100)
  },
  /** Moulds for the CSV export, by code. */
  exportQuery(db: Knex, workshopId: number) {
    return db('moulds as m').leftJoin('benches as b', function () {
      this.on('b.id', 'm.bench_id').andOn('b.workshop_id', 'm.workshop_id')
    }).where('m.workshop_id', workshopId)
      .select('m.code', 'm.casts', 'm.material', 'b.name as bench', 'm.cavity_litres', 'm.cast_length_m', 'm.prep_minutes',
        'm.clean_minutes', 'm.max_dwell_minutes', 'm.pulls', 'm.expected_pulls', 'm.state', 'm.state_reason',
        'm.cavities', 'm.cast_type', 'm.surface_area_m2', 'm.shell_thickness_mm')
      .orderBy('m.code')
  },
}

/** The floor's writes to a mould: its row locked for a pour's step, its state and pull count. */
export const mouldFloorRepo = {
  forStep(db: Knex, workshopId: number, id: number) {
    return db('moulds').first('id', 'code', 'state', 'pulls', 'cavity_litres', 'max_dwell_minutes', 'prep_minutes', 'clean_minutes', 'version',
      'cavities', 'cast_type', 'surface_area_m2', 'shell_thickness_mm')
      .where({ workshop_id: workshopId, id }).forUpdate()
  },
  /** Moves the mould's state (and optionally counts a pull), bumping its version. */
  async moveState(db: Knex, workshopId: number, id: number, state: string, actorId: number, pull = false) {
    await db('moulds').where({ workshop_id: workshopId, id }).update({
      state, state_changed_by: actorId, state_changed_at: db.fn.now(), version: db.raw('version + 1'), updated_at: db.fn.now(),
      ...(pull ? { pulls: db.raw('pulls + 1') } : {}),
    })
  },
}
