// Every knex call for benches.
import type { Knex } from 'knex'
import { UNIQUE_LABELS, updateVersioned } from './versioned'

export const BENCH_COLUMNS = ['id', 'name', 'kind', 'length_m', 'sort_order', 'archived_at', 'version', 'max_mixes'] as const

/** A benches row as BENCH_COLUMNS read it (NUMERIC comes back as a number, see server/utils/db.ts). */
export interface BenchRow {
  id: number
  name: string
  kind: string
  length_m: number | null
  sort_order: number
  archived_at: Date | null
  version: number
  max_mixes: number | null
}

export interface BenchInput { name?: string; kind?: string; lengthM?: number | null; sortOrder?: number; archived?: boolean; maxMixes?: number | null }

function toColumns(input: BenchInput, db: Knex) {
  return {
    ...(input.name !== undefined && { name: input.name }),
    ...(input.kind !== undefined && { kind: input.kind }),
    ...(input.lengthM !== undefined && { length_m: input.lengthM }),
    ...(input.sortOrder !== undefined && { sort_order: input.sortOrder }),
    ...(input.maxMixes !== undefined && { max_mixes: input.maxMixes }),
    ...(input.archived !== undefined && { archived_at: input.archived ? db.fn.now() : null }),
  }
}

export const benchesRepo = {
  list(db: Knex, workshopId: number): Promise<BenchRow[]> {
    return db('benches').select(BENCH_COLUMNS).where({ workshop_id: workshopId })
      .orderByRaw('archived_at IS NOT NULL, sort_order, name')
  },
  byId(db: Knex, workshopId: number, id: number): Promise<BenchRow | undefined> {
    return db('benches').first(BENCH_COLUMNS).where({ workshop_id: workshopId, id })
  },
  async insert(db: Knex, workshopId: number, input: BenchInput): Promise<BenchRow> {
    try {
      const [row] = await db('benches').insert({ workshop_id: workshopId, ...toColumns(input, db) }).returning(BENCH_COLUMNS)
      return row
    }
    catch (err) {
      rethrowDbError(err, UNIQUE_LABELS)
    }
  },
  /** Many benches at once (an import). */
  async insertMany(db: Knex, workshopId: number, rows: BenchInput[]) {
    for (let i = 0; i < rows.length; i += 500) await db('benches').insert(rows.slice(i, i + 500).map(r => ({ workshop_id: workshopId, ...toColumns(r, db) })))
  },
  update(db: Knex, workshopId: number, id: number, version: number, input: BenchInput): Promise<BenchRow> {
    return updateVersioned<BenchRow>(db, 'benches', { workshopId, id, version }, toColumns(input, db), BENCH_COLUMNS, 'Bench')
  },
}
