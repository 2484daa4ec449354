// Every knex call for plaster_lots, and the per-lot pour sums that stock on hand is computed from.
import type { Knex } from 'knex'
import type { LotPourSums } from '#shared/utils/catalogue'
import { UNIQUE_LABELS, updateVersioned } from './versioned'

export const LOT_COLUMNS = ['id', 'grade_id', 'lot_code', 'bags_received', 'bag_kg', 'received_on', 'use_by', 'notes', 'price_per_bag', 'archived_at', 'version'] as const

/** A plaster_lots row as LOT_COLUMNS read it (DATE as 'YYYY-MM-DD', NUMERIC as a number: server/utils/db.ts). */
export interface LotRow {
  id: number
  grade_id: number
  lot_code: string
  bags_received: number
  bag_kg: number
  received_on: string
  use_by: string | null
  notes: string | null
  /** minor units of the workshop currency; null when not known */
  price_per_bag: number | null
  archived_at: Date | null
  version: number
}

export interface LotInput { gradeId?: number; lotCode?: string; bagsReceived?: number; bagKg?: number; receivedOn?: string; useBy?: string | null; notes?: string | null; pricePerBag?: number | null; archived?: boolean }

function toColumns(input: LotInput, db: Knex) {
  return {
    ...(input.gradeId !== undefined && { grade_id: input.gradeId }),
    ...(input.lotCode !== undefined && { lot_code: input.lotCode }),
    ...(input.bagsReceived !== undefined && { bags_received: input.bagsReceived }),
    ...(input.bagKg !== undefined && { bag_kg: input.bagKg }),
    ...(input.receivedOn !== undefined && { received_on: input.receivedOn }),
    ...(input.useBy !== undefined && { use_by: input.useBy }),
    ...(input.notes !== undefined && { notes: input.notes }),
    ...(input.pricePerBag !== undefined && { price_per_bag: input.pricePerBag }),
    ...(input.archived !== undefined && { archived_at: input.archived ? db.fn.now() : null }),
  }
}

export const lotsRepo = {
  /** The lots with their grade's name, archived last, newest delivery first. */
  list(db: Knex, workshopId: number): Promise<(LotRow & { grade_name: string })[]> {
    return db('plaster_lots as l').join('plaster_grades as g', function () {
      this.on('g.id', 'l.grade_id').andOn('g.workshop_id', 'l.workshop_id')
    }).where('l.workshop_id', workshopId)
      .select(LOT_COLUMNS.map(c => `l.${c}`)).select('g.name as grade_name')
      .orderByRaw('l.archived_at IS NOT NULL, l.received_on DESC, l.lot_code')
  },
  byId(db: Knex, workshopId: number, id: number): Promise<LotRow | undefined> {
    return db('plaster_lots').first(LOT_COLUMNS).where({ workshop_id: workshopId, id })
  },
  /** Plaster per lot and pour state: recorded actual kg, and planned kg of pours without an actual. */
  async pourSums(db: Knex, workshopId: number): Promise<Map<number, LotPourSums[]>> {
    const rows: { lot_id: number; state: LotPourSums['state']; actual_kg: number; planned_kg: number }[] = await db('pours')
      .where({ workshop_id: workshopId }).whereNotNull('lot_id').groupBy('lot_id', 'state')
      .select('lot_id', 'state')
      .select(db.raw('coalesce(sum(plaster_kg_actual), 0)::float8 AS actual_kg'))
      .select(db.raw('coalesce(sum(plaster_kg_planned) FILTER (WHERE plaster_kg_actual IS NULL), 0)::float8 AS planned_kg'))
    const byLot = new Map<number, LotPourSums[]>()
    for (const r of rows) {
      const list = byLot.get(r.lot_id) ?? []
      list.push({ state: r.state, actualKg: r.actual_kg, plannedWithoutActualKg: r.planned_kg })
      byLot.set(r.lot_id, list)
    }
    return byLot
  },
  /** The lot codes this workshop already uses (a CSV import refuses them). */
  async codes(db: Knex, workshopId: number): Promise<Set<string>> {
    const rows: { lot_code: string }[] = await db('plaster_lots').select('lot_code').where({ workshop_id: workshopId })
    return new Set(rows.map(r => r.lot_code))
  },
  /** Many lots at once (CSV import, inside its transaction); `archived` ones are archived as they land. */
  async insertMany(db: Knex, workshopId: number, rows: (LotInput & { archived: boolean })[]) {
    const cols = rows.map(({ archived, ...input }) => ({ workshop_id: workshopId, ...toColumns(input, db), archived_at: archived ? db.fn.now() : null }))
    for (let i = 0; i < cols.length; i += 500) await db('plaster_lots').insert(cols.slice(i, i + 500))
  },
  async insert(db: Knex, workshopId: number, input: LotInput): Promise<LotRow> {
    try {
      const [row] = await db('plaster_lots').insert({ workshop_id: workshopId, ...toColumns(input, db) }).returning(LOT_COLUMNS)
      return row
    }
    catch (err) {
      rethrowDbError(err, UNIQUE_LABELS)
    }
  },
  update(db: Knex, workshopId: number, id: number, version: number, input: LotInput): Promise<LotRow> {
    return updateVersioned<LotRow>(db, 'plaster_lots', { workshopId, id, version }, toColumns(input, db), LOT_COLUMNS, 'Lot')
  },
  /** Lots for the CSV export, newest delivery first. */
  exportQuery(db: Knex, workshopId: number) {
    return db('plaster_lots as l').join('plaster_grades as g', function () {
      this.on('g.id', 'l.grade_id').andOn('g.workshop_id', 'l.workshop_id')
    }).where('l.workshop_id', workshopId)
      .select('l.lot_code', 'g.name as grade', 'l.bags_received', 'l.bag_kg', 'l.received_on', 'l.use_by', 'l.notes', 'l.price_per_bag')
      .select(db.raw('l.archived_at IS NOT NULL AS archived')).orderBy('l.received_on', 'desc')
  },
}
