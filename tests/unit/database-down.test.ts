// Which errors mean "the database is away" (a 503 with Retry-After) rather than a fault (500).
// The messages are node-postgres's and knex's own, as the soak's server logs recorded them.
import { describe, expect, it } from 'vitest'
import { isDatabaseUnavailable } from '../../server/utils/database-down'

describe('isDatabaseUnavailable', () => {
  it('knows pg\'s ended connection, bare and with the query knex puts before it', () => {
    expect(isDatabaseUnavailable(new Error('Connection terminated unexpectedly'))).toBe(true)
    const knexWrapped = new Error('select "day", "temp_c" from "shop_days" where "workshop_id" = $1 limit $2 - Connection terminated unexpectedly')
    expect(isDatabaseUnavailable(knexWrapped)).toBe(true)
    // as Nitro hands it to the error handler: an H3Error whose cause is knex's error
    expect(isDatabaseUnavailable({ statusCode: 500, message: knexWrapped.message, cause: knexWrapped })).toBe(true)
  })

  it('leaves a fault that only mentions a connection alone', () => {
    expect(isDatabaseUnavailable(new Error('insert into "pours" - null value in column "mould_id" violates not-null constraint'))).toBe(false)
    expect(isDatabaseUnavailable(new Error('The socket connection terminated the upload early'))).toBe(false)
    expect(isDatabaseUnavailable(Object.assign(new Error('duplicate key value'), { code: '23505' }))).toBe(false)
  })
})
