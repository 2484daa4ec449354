// CSV downloads, streamed: rows are read in pages and flow through csv-stringify to the
// response, so a long register never sits in memory whole. (knex's own .stream() needs the
// pg-query-stream package, which the project does not carry; paging does the same job here.)
//
// Every file is safe to open in a spreadsheet: a text cell that begins with = + - @, a tab or
// a carriage return is prefixed with ' so it is read as text, never run as a formula (OWASP,
// "CSV Injection"; csv-stringify's escape_formulas). Numbers are left alone: a JavaScript
// number is never escaped, and a column marked `number` keeps a plain decimal such as -3.5
// (PostgreSQL numerics arrive as text) while any other text in it is escaped like the rest.
// A UTF-8 byte-order mark goes first so spreadsheet programs read °C and accented names as
// UTF-8 (RFC 3629 §6: the BOM as an encoding signature).
import { Readable } from 'node:stream'
import type { H3Event } from 'h3'
import type { Knex } from 'knex'
import { stringify, type CastReturnObject, type CastingContext } from 'csv-stringify'

const PAGE_ROWS = 500

async function* pages(query: Knex.QueryBuilder) {
  for (let offset = 0; ; offset += PAGE_ROWS) {
    const rows: Record<string, unknown>[] = await query.clone().limit(PAGE_ROWS).offset(offset)
    yield* rows
    if (rows.length < PAGE_ROWS) return
  }
}

/** `number`: the column holds figures (text from a numeric column, or toFixed): plain decimals stay unescaped. */
export type CsvColumns = { key: string; header: string; number?: boolean }[]

/** A plain decimal figure: a leading minus here is a sign, not a formula. */
const PLAIN_DECIMAL = /^-\d+(\.\d+)?$/

/** The csv-stringify options every export shares: header row, BOM, formula escaping, casts. */
export function csvOptions(columns: CsvColumns) {
  const numeric = new Set(columns.filter(c => c.number).map(c => c.key))
  return {
    header: true,
    bom: true,
    escape_formulas: true,
    columns: columns.map(({ key, header }) => ({ key, header })),
    cast: {
      boolean: (v: boolean) => (v ? 'yes' : 'no'),
      date: (v: Date) => v.toISOString(),
      // only negative figures need the exception (other decimals start with a digit); csv-stringify
      // merges a cell's returned options over the file's, escape_formulas included
      string: (v: string, ctx: CastingContext) => (numeric.has(String(ctx.column)) && PLAIN_DECIMAL.test(v)
        ? { value: v, escape_formulas: false } as CastReturnObject
        : v),
    },
  }
}

/** Sends `query`'s rows as a CSV attachment; `query` must be ordered so pages do not overlap. */
export function sendCsv(event: H3Event, filename: string, query: Knex.QueryBuilder, columns: CsvColumns) {
  return sendCsvRows(event, filename, pages(query), columns)
}

/**
 * Sends rows from any async source (a keyset-paged repo reader, an array, say) as a CSV
 * attachment. Readable.from pulls the next row only when csv-stringify and the socket want
 * more, so a slow download holds back the database reads instead of piling rows up in memory.
 */
export function sendCsvRows(event: H3Event, filename: string, source: AsyncIterable<Record<string, unknown>> | Iterable<Record<string, unknown>>, columns: CsvColumns) {
  setResponseHeaders(event, {
    'content-type': 'text/csv; charset=utf-8',
    'content-disposition': `attachment; filename="${filename.replace(/[^\w.-]/g, '_')}"`,
    'cache-control': 'no-store',
  })
  const csv = stringify(csvOptions(columns))
  const rows = Readable.from(source)
  rows.on('error', err => csv.destroy(err))
  return sendStream(event, rows.pipe(csv))
}
