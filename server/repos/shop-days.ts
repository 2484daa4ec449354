// Every knex call for shop_days: the shop's temperature and humidity per local day.
import type { Knex } from 'knex'

export interface ShopDayRow { day: string; temp_c: number; humidity_pct: number }

export const shopDaysRepo = {
  between(db: Knex, workshopId: number, from: string, to: string): Promise<ShopDayRow[]> {
    return db('shop_days').select('day', 'temp_c', 'humidity_pct')
      .where({ workshop_id: workshopId }).whereBetween('day', [from, to]).orderBy('day')
  },
  async tempOn(db: Knex, workshopId: number, day: string): Promise<number | null> {
    const row = await db('shop_days').first('temp_c').where({ workshop_id: workshopId, day })
    return row ? Number(row.temp_c) : null
  },
  on(db: Knex, workshopId: number, day: string): Promise<ShopDayRow | undefined> {
    return db('shop_days').first('day', 'temp_c', 'humidity_pct').where({ workshop_id: workshopId, day })
  },
  async upsert(db: Knex, workshopId: number, setBy: number, v: { day: string; tempC: number; humidityPct: number }): Promise<ShopDayRow> {
    const [row] = await db('shop_days')
      .insert({ workshop_id: workshopId, day: v.day, temp_c: v.tempC, humidity_pct: v.humidityPct, set_by: setBy })
      .onConflict(['workshop_id', 'day'])
      .merge({ temp_c: v.tempC, humidity_pct: v.humidityPct, set_by: setBy, updated_at: db.fn.now() })
      .returning(['day', 'temp_c', 'humidity_pct'])
    return row
  },
}

export function shopDayDto(r: ShopDayRow) {
  return { day: r.day, tempC: Number(r.temp_c), humidityPct: Number(r.humidity_pct) }
}
