// Every knex call for the shop's closures and the casters' absences; a caster's own hours live
// on their users row (usersRepo.setCasterHours).
import type { Knex } from 'knex'

export interface DaySpanRow {
  id: number
  user_id?: number
  from_day: string
  to_day: string
  reason: string | null
}

type Span = { fromDay: string; toDay: string; reason?: string | null }

export const calendarsRepo = {
  /** Closures ending on or after `fromDay` (all when null), in date order. */
  closures(db: Knex, workshopId: number, fromDay: string | null = null): Promise<DaySpanRow[]> {
    const q = db('shop_closures').select('id', db.raw(`to_char(from_day, 'YYYY-MM-DD') AS from_day`), db.raw(`to_char(to_day, 'YYYY-MM-DD') AS to_day`), 'reason')
      .where({ workshop_id: workshopId }).orderBy(['from_day', 'id'])
    return fromDay ? q.where('to_day', '>=', fromDay) : q
  },
  async replaceClosures(db: Knex, workshopId: number, spans: Span[]) {
    await db('shop_closures').where({ workshop_id: workshopId }).del()
    if (spans.length) await db('shop_closures').insert(spans.map(s => ({ workshop_id: workshopId, from_day: s.fromDay, to_day: s.toDay, reason: s.reason ?? null })))
  },
  /** Absences of the workshop's casters ending on or after `fromDay` (all when null). */
  absences(db: Knex, workshopId: number, fromDay: string | null = null): Promise<DaySpanRow[]> {
    const q = db('caster_absences').select('id', 'user_id', db.raw(`to_char(from_day, 'YYYY-MM-DD') AS from_day`), db.raw(`to_char(to_day, 'YYYY-MM-DD') AS to_day`), 'reason')
      .where({ workshop_id: workshopId }).orderBy(['user_id', 'from_day', 'id'])
    return fromDay ? q.where('to_day', '>=', fromDay) : q
  },
  async replaceAbsences(db: Knex, workshopId: number, userId: number, spans: Span[]) {
    await db('caster_absences').where({ workshop_id: workshopId, user_id: userId }).del()
    if (spans.length) {
      await db('caster_absences').insert(spans.map(s => ({ workshop_id: workshopId, user_id: userId, from_day: s.fromDay, to_day: s.toDay, reason: s.reason ?? null })))
    }
  },
  /** The workshop's active casters with their own days, hours and mixes at once. */
  casters(db: Knex, workshopId: number): Promise<{ id: number; name: string; caster_days: number[] | null; caster_start: string | null; caster_end: string | null; max_mixes: number }[]> {
    return db('users').select('id', 'name', 'caster_days', db.raw(`to_char(caster_start, 'HH24:MI') AS caster_start`), db.raw(`to_char(caster_end, 'HH24:MI') AS caster_end`), 'max_mixes')
      .where({ workshop_id: workshopId, role: 'caster' }).whereNull('disabled_at').orderBy('id')
  },
}
