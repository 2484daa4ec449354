// One knex (and one pg pool) per server process.
import knex, { type Knex } from 'knex'
import pg from 'pg'

// Return DATE columns as 'YYYY-MM-DD' strings and NUMERIC as numbers: dates are calendar
// days in the workshop's zone, and our numerics are measured values well inside double range.
pg.types.setTypeParser(1082, v => v)
pg.types.setTypeParser(1700, v => Number(v))
pg.types.setTypeParser(20, v => Number(v))

let instance: Knex | undefined

export function useDb(): Knex {
  if (!instance) {
    instance = knex({
      client: 'pg',
      connection: appEnv().DATABASE_URL,
      pool: { min: 0, max: 10 },
    })
  }
  return instance
}

export async function closeDb() {
  if (instance) {
    const k = instance
    instance = undefined
    await k.destroy()
  }
}
