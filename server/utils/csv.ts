// CSV downloads, streamed: rows flow from the database cursor through csv-stringify to the
// response, so a long register never sits in memory whole.
import type { H3Event } from 'h3'
import type { Knex } from 'knex'
import { stringify } from 'csv-stringify'

export function sendCsv(event: H3Event, filename: string, query: Knex.QueryBuilder, columns: { key: string; header: string }[]) {
  setResponseHeaders(event, {
    'content-type': 'text/csv; charset=utf-8',
    'content-disposition': `attachment; filename="${filename.replace(/[^\w.-]/g, '_')}"`,
    'cache-control': 'no-store',
  })
  const csv = stringify({ header: true, columns, cast: { boolean: v => (v ? 'yes' : 'no'), date: v => v.toISOString() } })
  const rows = query.stream()
  rows.on('error', err => csv.destroy(err))
  return sendStream(event, rows.pipe(csv))
}
