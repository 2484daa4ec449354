// The workshop row (settings). The caller's own workshop only.
import type { Knex } from 'knex'
import type { ShiftBreak, WorkshopSettings } from '#shared/utils/workshop-schemas'
import type { WorkshopLocale } from '#shared/utils/workshop-format'

export interface WorkshopRow {
  id: number
  name: string
  units: 'metric' | 'imperial'
  timezone: string
  shift_start: string
  shift_end: string
  /** jsonb: the day's breaks, local 'HH:MM' pairs (the driver parses it) */
  shift_breaks: ShiftBreak[]
  working_days: number[]
  default_shop_temp_c: number
  default_humidity_pct: number
  locale: WorkshopLocale
  /** the heaviest crate it packs, kg (numeric, parsed to a number: server/utils/db.ts) */
  crate_max_kg: number
  version: number
}

/** What a set-up or a save writes; a save without a locale or heaviest crate keeps the workshop's own. */
type WorkshopWrite = Omit<WorkshopRow, 'id' | 'version' | 'locale' | 'crate_max_kg'> & { locale?: WorkshopLocale; crate_max_kg?: number }

const COLUMNS = ['id', 'name', 'units', 'timezone', 'shift_start', 'shift_end', 'shift_breaks', 'working_days', 'default_shop_temp_c', 'default_humidity_pct', 'locale', 'crate_max_kg', 'version']

// the driver writes a JS array as a PostgreSQL array: the jsonb column gets its JSON text
const asColumns = <T extends { shift_breaks: ShiftBreak[] }>(row: T) => ({ ...row, shift_breaks: JSON.stringify(row.shift_breaks) })

export const workshopsRepo = {
  async get(db: Knex, id: number): Promise<WorkshopRow | undefined> {
    const row: WorkshopRow | undefined = await db('workshops').first(COLUMNS).where({ id })
    return row
  },
  /** Today as a calendar day in the workshop's own zone (use-by dates are calendar days there). */
  async today(db: Knex, id: number): Promise<string> {
    const r: { today: string } = await db('workshops').where({ id })
      .first(db.raw('to_char((now() AT TIME ZONE timezone)::date, \'YYYY-MM-DD\') AS today'))
    return r.today
  },
  /** Whether any workshop exists: the first-run set-up is offered only while none does. */
  async any(db: Knex): Promise<boolean> {
    return Boolean(await db('workshops').first('id'))
  },
  /** A new workshop (first-run set-up). */
  async insert(db: Knex, row: WorkshopWrite): Promise<WorkshopRow> {
    const [created] = await db('workshops').insert(asColumns(row)).returning(COLUMNS)
    return created
  },
  /** Updates when the version matches; returns undefined when someone else changed it first. */
  async update(db: Knex, id: number, version: number, patch: WorkshopWrite): Promise<WorkshopRow | undefined> {
    const [row] = await db('workshops').where({ id, version })
      .update({ ...asColumns(patch), version: db.raw('version + 1'), updated_at: db.fn.now() }).returning(COLUMNS)
    return row
  },
}

/** GET / PATCH /api/workshop: the settings as the settings form edits them (times as HH:MM). */
export function workshopDto(row: WorkshopRow): WorkshopSettings & { locale: WorkshopLocale; crateMaxKg: number } {
  return {
    name: row.name,
    units: row.units,
    timezone: row.timezone,
    shiftStart: row.shift_start.slice(0, 5),
    shiftEnd: row.shift_end.slice(0, 5),
    shiftBreaks: row.shift_breaks,
    workingDays: row.working_days,
    defaultShopTempC: row.default_shop_temp_c,
    defaultHumidityPct: row.default_humidity_pct,
    locale: row.locale,
    crateMaxKg: Number(row.crate_max_kg),
    version: row.version,
  }
}
