// Every knex call for workshop_rates: one row per workshop, written on the first save; until
// then a read answers the table's defaults (a read never writes).
import type { Knex } from 'knex'

export interface RatesRow {
  workshop_id: number
  currency: string
  plaster_per_bag: number
  mould_per_profile: number
  cast_per_length: number
  cast_per_piece: number
  fettle_per_piece: number
  fix_per_metre: number
  delivery_per_trip: number
  margin_bp: number
  tax_bp: number
  deposit_bp: number
  /** the hourly labour rate the job's actual cost is priced at (shared/utils/job-cost.ts) */
  labour_per_hour: number
  version: number
}

const COLUMNS = ['workshop_id', 'currency', 'plaster_per_bag', 'mould_per_profile', 'cast_per_length', 'cast_per_piece',
  'fettle_per_piece', 'fix_per_metre', 'delivery_per_trip', 'margin_bp', 'tax_bp', 'deposit_bp', 'labour_per_hour', 'version'] as const

/** The migration's column defaults: what a workshop that never saved its rates has. */
const DEFAULTS: Omit<RatesRow, 'workshop_id'> = {
  currency: 'GBP', plaster_per_bag: 0, mould_per_profile: 0, cast_per_length: 0, cast_per_piece: 0, fettle_per_piece: 0,
  fix_per_metre: 0, delivery_per_trip: 0, margin_bp: 0, tax_bp: 0, deposit_bp: 0, labour_per_hour: 0, version: 1,
}

/** A save's columns; the labour rate is kept when a save leaves it out. */
export type RatesColumns = Omit<RatesRow, 'workshop_id' | 'version' | 'labour_per_hour'> & { labour_per_hour?: number }

export const ratesRepo = {
  async get(db: Knex, workshopId: number): Promise<RatesRow> {
    return (await db('workshop_rates').first(COLUMNS).where({ workshop_id: workshopId })) ?? { ...DEFAULTS, workshop_id: workshopId }
  },
  async update(db: Knex, workshopId: number, version: number, patch: RatesColumns): Promise<RatesRow> {
    await db('workshop_rates').insert({ workshop_id: workshopId }).onConflict('workshop_id').ignore()
    // one row per workshop: its "id" is the workshop's
    const rows = await db('workshop_rates').where({ workshop_id: workshopId, version })
      .update({ ...patch, version: db.raw('version + 1'), updated_at: db.fn.now() }).returning(COLUMNS as unknown as string[])
    if (!rows[0]) conflict('The rates were changed by someone else; reload and try again')
    return rows[0] as RatesRow
  },
}
