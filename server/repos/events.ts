// The append-only register (a trigger refuses update and delete on events).
import type { Knex } from 'knex'

export interface EventEntry {
  workshopId: number
  entity: string
  entityId: number
  type: string
  actorId: number | null
  data?: Record<string, unknown>
  /** When it happened; now when left out (a tablet's step names its own, maybe back-dated). */
  at?: Date
  backdated?: boolean
}

/** Appends one entry: who did what to which entity, when. */
export function recordEvent(db: Knex, e: EventEntry) {
  return db('events').insert({
    workshop_id: e.workshopId, entity: e.entity, entity_id: String(e.entityId), type: e.type,
    actor_id: e.actorId, at: e.at ? e.at.toISOString() : db.fn.now(), data: JSON.stringify(e.data ?? {}),
    ...(e.backdated === undefined ? {} : { backdated: e.backdated }),
  })
}
