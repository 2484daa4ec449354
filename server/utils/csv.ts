// CSV downloads, streamed: rows are read in pages and flow through csv-stringify to the
// response, so a long register never sits in memory whole. (knex's own .stream() needs the
// pg-query-stream package, which the project does not carry; paging does the same job here.)
import { Readable } from 'node:stream'
import type { H3Event } from 'h3'
import type { Knex } from 'knex'
import { stringify } from 'csv-stringify'

const PAGE_ROWS = 500

async function* pages(query: Knex.QueryBuilder) {
  for (let offset = 0; ; offset += PAGE_ROWS) {
    const rows: Record<string, unknown>[] = await query.clone().limit(PAGE_ROWS).offset(offset)
    yield* rows
    if (rows.length < PAGE_ROWS) return
  }
}

/** Sends `query`'s rows as a CSV attachment; `query` must be ordered so pages do not overlap. */
export function sendCsv(event: H3Event, filename: string, query: Knex.QueryBuilder, columns: { key: string; header: string }[]) {
  setResponseHeaders(event, {
    'content-type': 'text/csv; charset=utf-8',
    'content-disposition': `attachment; filename="${filename.replace(/[^\w.-]/g, '_')}"`,
    'cache-control': 'no-store',
  })
  const csv = stringify({ header: true, columns, cast: { boolean: v => (v ? 'yes' : 'no'), date: v => v.toISOString() } })
  const rows = Readable.from(pages(query))
  rows.on('error', err => csv.destroy(err))
  return sendStream(event, rows.pipe(csv))
}
