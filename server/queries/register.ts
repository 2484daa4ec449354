// The register screen's read, the casting register of a job: one row per pour with its pieces (one per cavity
// of its mould: every mark, in cavity order), everything that traces the pieces back to how they were cast. Times are formatted by
// PostgreSQL in the workshop's timezone, so a 100,000-row export does no per-row date work in JS.
import type { Knex } from 'knex'
import type { RegisterFilter } from '#shared/utils/register-schemas'
import { jobsRepo } from '../repos/jobs'
import { loadWorkshop } from '../services/workshop'
import type { RegisterPageDto, RegisterRow } from '#shared/types/register'

/** A download that stops reading for this long gives its database connection back (common practice). */
const STALL_SECONDS = 120

const local = (col: string, as: string) => `to_char(${col} AT TIME ZONE w.timezone, 'YYYY-MM-DD HH24:MI') AS ${as}`

const REGISTER_SELECT = [
  'p.id AS "pourId"', 'p.state', 'p.is_sample AS "isSample"',
  `(SELECT string_agg(x.mark, ' ' ORDER BY x.cavity) FROM pieces x WHERE x.pour_id = p.id AND x.workshop_id = p.workshop_id) AS mark`,
  'pc.id::int AS "pieceId"', 'pc.state AS "pieceState"', 'i.description AS item', 'm.code AS mould', 'm.cavities', 'g.name AS grade', 'l.lot_code AS lot', 'p.consistency', 'p.plaster_kg_actual AS "plasterKgActual"', 'p.water_kg_actual AS "waterKgActual"',
  'p.water_temp_c AS "waterTempC"', 'p.powder_temp_c AS "powderTempC"', 'p.shop_temp_c AS "shopTempC"', 'p.slurry_temp_c AS "slurryTempC"',
  local('p.mix_at', '"mixPlanned"'), local('p.mixing_at', '"mixingAt"'), local('p.poured_at', '"pouredAt"'),
  local('p.demould_open_at', '"demouldOpen"'), local('p.demould_close_at', '"demouldClose"'), local('p.demoulded_at', '"demouldedAt"'),
  'u.name AS caster', 'p.result', 'p.defect', 'p.backdated',
  `(SELECT count(*)::int FROM photos ph WHERE ph.workshop_id = p.workshop_id AND ph.job_id = i.job_id
     AND (ph.pour_id = p.id OR ph.piece_id IN (SELECT x.id FROM pieces x WHERE x.pour_id = p.id AND x.workshop_id = p.workshop_id))) AS photos`,
]

/** The job's pours joined to everything the register shows, filtered; no select, no order. */
function base(db: Knex, workshopId: number, jobId: number, f: RegisterFilter) {
  const q = db('pours as p')
    .join('job_items as i', function () {
      this.on('i.id', 'p.job_item_id').andOn('i.workshop_id', 'p.workshop_id')
    })
    .join('workshops as w', 'w.id', 'p.workshop_id')
    .join('moulds as m', function () {
      this.on('m.id', 'p.mould_id').andOn('m.workshop_id', 'p.workshop_id')
    })
    .join('plaster_grades as g', function () {
      this.on('g.id', 'p.grade_id').andOn('g.workshop_id', 'p.workshop_id')
    })
    .leftJoin('plaster_lots as l', function () {
      this.on('l.id', 'p.lot_id').andOn('l.workshop_id', 'p.workshop_id')
    })
    .leftJoin('users as u', function () {
      this.on('u.id', 'p.caster_id').andOn('u.workshop_id', 'p.workshop_id')
    })
    // the first piece's state (cavity 1): one row per pour however many pieces it made
    .leftJoin('pieces as pc', function () {
      this.on('pc.pour_id', 'p.id').andOn('pc.workshop_id', 'p.workshop_id').andOnVal('pc.cavity', 1)
    })
    .where({ 'p.workshop_id': workshopId, 'i.job_id': jobId })
  // the day a pour belongs to is the local day it was mixed (planned mix time until mixed)
  const day = '(coalesce(p.mixing_at, p.mix_at) AT TIME ZONE w.timezone)::date'
  if (f.from) q.whereRaw(`${day} >= ?::date`, [f.from])
  if (f.to) q.whereRaw(`${day} <= ?::date`, [f.to])
  if (f.result) q.where('p.result', f.result)
  if (f.mould) q.where('p.mould_id', f.mould)
  if (f.caster) q.where('p.caster_id', f.caster)
  return q
}

const registerRows = {
  async page(db: Knex, workshopId: number, jobId: number, f: RegisterFilter, page: number, pageSize: number) {
    const [rows, [count]] = await Promise.all([
      base(db, workshopId, jobId, f).select(db.raw(REGISTER_SELECT.join(', '))).orderBy('p.id').limit(pageSize).offset((page - 1) * pageSize),
      base(db, workshopId, jobId, f).count<{ total: string }[]>('p.id as total'),
    ])
    return { rows: rows as RegisterRow[], total: Number(count?.total ?? 0) }
  },
  /**
   * Every row, through one server-side cursor (DECLARE … FETCH, PostgreSQL's own way to read a
   * big result in pieces): the query is planned and run once and each FETCH continues where the
   * last stopped, so the export costs one pass however long the job is, and at most one page is in
   * memory. Keyset pages over this join cost a page each the work of every row still to come
   * whenever the planner lacks fresh statistics (a 100,000-pour export took 48 s that way, see
   * tests/bench/register.ts). The cursor lives in a read-only transaction on one pooled
   * connection, closed when the download ends or stops; a stalled download releases it after
   * STALL_SECONDS. The rows come from one snapshot, so the file is the register at one moment.
   */
  async* all(db: Knex, workshopId: number, jobId: number, f: RegisterFilter, pageRows = 1000): AsyncGenerator<RegisterRow> {
    const { sql, bindings } = base(db, workshopId, jobId, f).select(db.raw(REGISTER_SELECT.join(', '))).orderBy('p.id').toSQL()
    const trx = await db.transaction({ readOnly: true })
    try {
      await trx.raw(`SET LOCAL idle_in_transaction_session_timeout = '${STALL_SECONDS}s'`)
      await trx.raw(`DECLARE register_rows NO SCROLL CURSOR FOR ${sql}`, bindings)
      for (;;) {
        const { rows } = await trx.raw<{ rows: RegisterRow[] }>(`FETCH ${Math.trunc(pageRows)} FROM register_rows`)
        yield* rows
        if (rows.length < pageRows) break
      }
      await trx.commit()
    }
    finally {
      if (!trx.isCompleted()) await trx.rollback().catch(() => undefined)
    }
  },
  /** The moulds and casters that appear in the job's register, for the page's filters. */
  async choices(db: Knex, workshopId: number, jobId: number) {
    const [moulds, casters] = await Promise.all([
      base(db, workshopId, jobId, {}).distinct('m.id', 'm.code').orderBy('m.code'),
      base(db, workshopId, jobId, {}).whereNotNull('u.id').distinct('u.id', 'u.name').orderBy('u.name'),
    ])
    return { moulds: moulds as { id: number; code: string }[], casters: casters as { id: number; name: string }[] }
  },
}

async function jobOf(db: Knex, workshopId: number, jobId: number) {
  const job = await jobsRepo.byId(db, workshopId, jobId)
  if (!job) notFound('Job')
  return job
}

/** GET /api/jobs/:id/register: one page of the job's register and the moulds and casters to filter by. */
export async function registerPage(workshopId: number, jobId: number, f: RegisterFilter, page: number, pageSize: number): Promise<RegisterPageDto> {
  const db = useDb()
  const job = await jobOf(db, workshopId, jobId)
  const [{ rows, total }, choices] = await Promise.all([
    registerRows.page(db, workshopId, jobId, f, page, pageSize),
    registerRows.choices(db, workshopId, jobId),
  ])
  return { job: { id: job.id, code: job.code, title: job.title }, page, pageSize, total, rows, ...choices }
}

/** The register export: the job, the workshop's zone its times are in, and every row through one cursor. */
export async function registerExport(workshopId: number, jobId: number, f: RegisterFilter) {
  const db = useDb()
  const job = await jobOf(db, workshopId, jobId)
  const ws = await loadWorkshop(db, workshopId)
  return { job, timezone: ws.timezone, units: ws.units, rows: registerRows.all(db, workshopId, jobId, f) }
}
