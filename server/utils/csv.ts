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

type CsvColumns = { key: string; header: string }[]

/** Sends `query`'s rows as a CSV attachment; `query` must be ordered so pages do not overlap. */
export function sendCsv(event: H3Event, filename: string, query: Knex.QueryBuilder, columns: CsvColumns) {
  return sendCsvRows(event, filename, pages(query), columns)
}

/**
 * Sends rows from any async source (a keyset-paged repo reader, say) as a CSV attachment.
 * Readable.from pulls the next row only when csv-stringify and the socket want more, so a slow
 * download holds back the database reads instead of piling rows up in memory.
 */
export function sendCsvRows(event: H3Event, filename: string, source: AsyncIterable<Record<string, unknown>>, columns: CsvColumns) {
  setResponseHeaders(event, {
    'content-type': 'text/csv; charset=utf-8',
    'content-disposition': `attachment; filename="${filename.replace(/[^\w.-]/g, '_')}"`,
    'cache-control': 'no-store',
  })
  const csv = stringify({ header: true, columns, cast: { boolean: v => (v ? 'yes' : 'no'), date: v => v.toISOString() } })
  const rows = Readable.from(source)
  rows.on('error', err => csv.destroy(err))
  return sendStream(event, rows.pipe(csv))
}
