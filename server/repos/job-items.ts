// Every knex call for job_items, joined with the mould and grade the calculator needs.
import type { Knex } from 'knex'
import type { PlasterRunWall } from '#shared/utils/plaster-cutlist'

export const ITEM_COLUMNS = ['id', 'job_id', 'mould_id', 'profile', 'description', 'quantity', 'run_m', 'walls', 'min_piece_m',
  'spares_pct', 'pieces_needed', 'grade_id', 'consistency', 'sort_order', 'version', 'profile_id', 'projection_m', 'saw_cut_m', 'corner_block_leg_m'] as const

/** A job_items row as ITEM_COLUMNS read it (NUMERIC as a number: server/utils/db.ts). */
export interface ItemRow {
  id: number
  job_id: number
  mould_id: number | null
  profile: string | null
  description: string
  quantity: number | null
  run_m: number | null
  walls: PlasterRunWall[] | null
  min_piece_m: number | null
  spares_pct: number
  pieces_needed: number
  grade_id: number | null
  consistency: number | null
  sort_order: number
  version: number
  profile_id: number | null
  projection_m: number | null
  saw_cut_m: number | null
  corner_block_leg_m: number | null
}
/** An item with its mould's code, cavity and cast length and its grade's name. */
export type ItemListRow = ItemRow & { mould_code: string | null; cavity_litres: number | null; cast_length_m: number | null; grade_name: string | null }

/** The columns a write sets (walls as JSON text). */
export type ItemColumns = Omit<ItemRow, 'id' | 'job_id' | 'version' | 'walls'> & { walls: string | null }

export const jobItemsRepo = {
  forJob(db: Knex, workshopId: number, jobId: number): Promise<ItemListRow[]> {
    return db('job_items as i')
      .leftJoin('moulds as m', function () {
        this.on('m.id', 'i.mould_id').andOn('m.workshop_id', 'i.workshop_id')
      })
      .leftJoin('plaster_grades as g', function () {
        this.on('g.id', 'i.grade_id').andOn('g.workshop_id', 'i.workshop_id')
      })
      .where({ 'i.workshop_id': workshopId, 'i.job_id': jobId })
      .select(ITEM_COLUMNS.map(c => `i.${c}`))
      .select('m.code as mould_code', 'm.cavity_litres', 'm.cast_length_m', 'g.name as grade_name')
      .orderBy([{ column: 'i.sort_order' }, { column: 'i.id' }])
  },
  byId(db: Knex, workshopId: number, jobId: number, id: number): Promise<ItemRow | undefined> {
    return db('job_items').first(ITEM_COLUMNS).where({ workshop_id: workshopId, job_id: jobId, id })
  },
  async insert(db: Knex, workshopId: number, jobId: number, cols: ItemColumns): Promise<ItemRow> {
    const [row] = await db('job_items').insert({ workshop_id: workshopId, job_id: jobId, ...cols }).returning(ITEM_COLUMNS)
    return row
  },
  /** An item made from an accepted quote, with the shop's estimate for it and the client's price (minor units). */
  async insertFromQuote(db: Knex, workshopId: number, jobId: number, cols: ItemColumns, estimateMinor: number, priceMinor: number): Promise<void> {
    await db('job_items').insert({ workshop_id: workshopId, job_id: jobId, ...cols, estimate_minor: estimateMinor, price_minor: priceMinor })
  },
  /** Many items at once (an import), each naming its job. */
  async insertMany(db: Knex, workshopId: number, rows: (ItemColumns & { job_id: number })[]) {
    for (let i = 0; i < rows.length; i += 500) await db('job_items').insert(rows.slice(i, i + 500).map(r => ({ workshop_id: workshopId, ...r })))
  },
  async update(db: Knex, workshopId: number, jobId: number, id: number, version: number, cols: ItemColumns): Promise<ItemRow | undefined> {
    const [row] = await db('job_items').where({ workshop_id: workshopId, job_id: jobId, id, version })
      .update({ ...cols, version: db.raw('version + 1'), updated_at: db.fn.now() }).returning(ITEM_COLUMNS)
    return row
  },
  remove(db: Knex, workshopId: number, jobId: number, id: number) {
    return db('job_items').where({ workshop_id: workshopId, job_id: jobId, id }).del()
  },
  /** Items a pour already refers to cannot be deleted (the register keeps them). */
  async hasPours(db: Knex, workshopId: number, id: number) {
    return !!(await db('pours').first('id').where({ workshop_id: workshopId, job_item_id: id }))
  },
  /** Items (all jobs, or one) for the CSV export. */
  exportQuery(db: Knex, workshopId: number, jobId?: number) {
    const q = db('job_items as i').join('jobs as j', function () {
      this.on('j.id', 'i.job_id').andOn('j.workshop_id', 'i.workshop_id')
    }).leftJoin('moulds as m', function () {
      this.on('m.id', 'i.mould_id').andOn('m.workshop_id', 'i.workshop_id')
    }).leftJoin('plaster_grades as g', function () {
      this.on('g.id', 'i.grade_id').andOn('g.workshop_id', 'i.workshop_id')
    }).where('i.workshop_id', workshopId)
      .select('j.code as job', 'i.description', 'm.code as mould', 'i.profile', 'i.quantity', 'i.run_m', 'i.spares_pct',
        'i.pieces_needed', 'g.name as grade', 'i.consistency')
      .orderBy([{ column: 'j.code' }, { column: 'i.sort_order' }, { column: 'i.id' }])
    return jobId ? q.where('i.job_id', jobId) : q
  },
}
