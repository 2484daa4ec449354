// The append-only register (a trigger refuses update and delete on events).
import type { Knex } from 'knex'

/** Appends one entry: who did what to which entity, now. */
export function recordEvent(db: Knex, e: { workshopId: number; entity: string; entityId: number; type: string; actorId: number; data?: Record<string, unknown> }) {
  return db('events').insert({
    workshop_id: e.workshopId, entity: e.entity, entity_id: String(e.entityId), type: e.type,
    actor_id: e.actorId, at: db.fn.now(), data: JSON.stringify(e.data ?? {}),
  })
}
