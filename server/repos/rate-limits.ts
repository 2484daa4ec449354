// The rate_limits table belongs to rate-limiter-flexible's PostgreSQL store (server/utils/rate-limit.ts),
// which writes it; this repo only removes counters whose window has ended (`expire` is the
// store's own epoch in milliseconds).
import type { Knex } from 'knex'

export const rateLimitsRepo = {
  deleteExpired(db: Knex, nowMs = Date.now()): Promise<number> {
    return db('rate_limits').whereNotNull('expire').where('expire', '<', nowMs).delete()
  },
}
