// Every knex call for benches.
import type { Knex } from 'knex'
import { UNIQUE_LABELS, updateVersioned } from './versioned'

export const BENCH_COLUMNS = ['id', 'name', 'kind', 'length_m', 'sort_order', 'archived_at', 'version'] as const

export interface BenchInput { name?: string; kind?: string; lengthM?: number | null; sortOrder?: number; archived?: boolean }

function toColumns(input: BenchInput, db: Knex) {
  return {
    ...(input.name !== undefined && { name: input.name }),
    ...(input.kind !== undefined && { kind: input.kind }),
    ...(input.lengthM !== undefined && { length_m: input.lengthM }),
    ...(input.sortOrder !== undefined && { sort_order: input.sortOrder }),
    ...(input.archived !== undefined && { archived_at: input.archived ? db.fn.now() : null }),
  }
}

export const benchesRepo = {
  list(db: Knex, workshopId: number) {
    return db('benches').select(BENCH_COLUMNS).where({ workshop_id: workshopId })
      .orderByRaw('archived_at IS NOT NULL, sort_order, name')
  },
  byId(db: Knex, workshopId: number, id: number) {
    return db('benches').first(BENCH_COLUMNS).where({ workshop_id: workshopId, id })
  },
  async insert(db: Knex, workshopId: number, input: BenchInput) {
    try {
      const [row] = await db('benches').insert({ workshop_id: workshopId, ...toColumns(input, db) }).returning(BENCH_COLUMNS)
      return row
    }
    catch (err) {
      rethrowDbError(err, UNIQUE_LABELS)
    }
  },
  update(db: Knex, workshopId: number, id: number, version: number, input: BenchInput) {
    return updateVersioned(db, 'benches', { workshopId, id, version }, toColumns(input, db), BENCH_COLUMNS, 'Bench')
  },
}
