// Reading a CSV file a person saved from their spreadsheet (RFC 4180, parsed by csv-parse).
// What goes wrong in practice is said in their words before any row is read: a workbook
// (.xlsx and .ods are zip archives: local file header signature 50 4B 03 04, PKWARE APPNOTE.TXT
// §4.3.7; old .xls is an OLE2 compound file, D0 CF 11 E0), UTF-16 "Unicode text" (a byte-order
// mark FF FE or FE FF, RFC 2781 §3.2, or NUL bytes), and 8-bit encodings such as Windows-1252
// (bytes that are not valid UTF-8, RFC 3629 §3). A UTF-8 byte-order mark, as Setline's own
// exports write, is dropped. A semicolon header is accepted, as spreadsheets set to a decimal
// comma save it (common practice). A cell Setline's export escaped against formulas (a leading
// ' before = + - @) is read back without the quote.
import { parse } from 'csv-parse/sync'

const SAVE_AS = 'in your spreadsheet choose "Save as" and the type "CSV UTF-8 (comma delimited)", then upload that file'

/** The file's text, or the problem with it in the user's words. */
export function decodeCsvFile(bytes: Buffer): { text: string } | { problem: string } {
  if (!bytes.length) return { problem: 'The file is empty' }
  if (bytes.length >= 4 && bytes[0] === 0x50 && bytes[1] === 0x4B && bytes[2] === 0x03 && bytes[3] === 0x04) {
    return { problem: `This file is a spreadsheet workbook (such as .xlsx or .ods), not CSV: ${SAVE_AS}` }
  }
  if (bytes.length >= 4 && bytes[0] === 0xD0 && bytes[1] === 0xCF && bytes[2] === 0x11 && bytes[3] === 0xE0) {
    return { problem: `This file is an old Excel workbook (.xls), not CSV: ${SAVE_AS}` }
  }
  if ((bytes[0] === 0xFF && bytes[1] === 0xFE) || (bytes[0] === 0xFE && bytes[1] === 0xFF) || bytes.subarray(0, 4096).includes(0)) {
    return { problem: `This file is saved as UTF-16 ("Unicode text"), not UTF-8: ${SAVE_AS}` }
  }
  const body = bytes[0] === 0xEF && bytes[1] === 0xBB && bytes[2] === 0xBF ? bytes.subarray(3) : bytes
  try {
    return { text: new TextDecoder('utf-8', { fatal: true }).decode(body) }
  }
  catch {
    return { problem: `This file is not UTF-8 (it may be saved as Windows-1252 or Latin-1, where °, é or £ are stored differently): ${SAVE_AS}` }
  }
}

/** The header and the records (line numbers as in the file, the header being line 1). */
export function parseCsvText(text: string): { header: string[]; records: { line: number; cells: string[] }[] } | { problem: string } {
  const firstLine = text.slice(0, text.search(/\r?\n|$/))
  const delimiter = (firstLine.match(/;/g)?.length ?? 0) > (firstLine.match(/,/g)?.length ?? 0) ? ';' : ','
  let rows: { record: string[]; info: { lines: number } }[]
  try {
    rows = parse(text, { delimiter, relax_column_count: true, skip_empty_lines: true, trim: true, info: true }) as unknown as typeof rows
  }
  catch (err) {
    const line = (err as { lines?: number }).lines
    return { problem: `The file is not valid CSV${line ? ` near line ${line}` : ''}: check for a quote (") that is not closed` }
  }
  if (!rows.length) return { problem: 'The file has no header row' }
  const unescape = (v: string) => (/^'[=+\-@\t\r]/.test(v) ? v.slice(1) : v)
  const [head, ...rest] = rows
  return {
    header: head!.record.map(h => h.trim()),
    records: rest.filter(r => r.record.some(c => c !== '')).map(r => ({ line: r.info.lines, cells: r.record.map(unescape) })),
  }
}

/** A figure in a cell: '' is empty; a unit, a decimal comma or words are a problem in the user's words. */
export function readNumberCell(raw: string, column: string): { value: number | null } | { problem: string } {
  if (raw === '') return { value: null }
  if (/^-?\d+(\.\d+)?$/.test(raw)) return { value: Number(raw) }
  if (/^-?\d+,\d+$/.test(raw)) return { problem: `${column}: write ${raw} with a decimal point (${raw.replace(',', '.')})` }
  if (/^-?\d+([.,]\d+)?\s*\S+$/.test(raw)) {
    return { problem: `${column}: write the figure alone (${raw.match(/^-?\d+([.,]\d+)?/)![0]}); the unit belongs in the column name, "${column}"` }
  }
  return { problem: `${column}: "${raw.slice(0, 40)}" is not a number` }
}

/** A calendar day in a cell: YYYY-MM-DD; another format is named as such. */
export function readDayCell(raw: string, column: string): { value: string | null } | { problem: string } {
  if (raw === '') return { value: null }
  if (/^\d{4}-\d{2}-\d{2}$/.test(raw)) return { value: raw }
  if (/^\d{1,4}[/.-]\d{1,2}[/.-]\d{1,4}$/.test(raw)) return { problem: `${column}: ${raw} is a date in another format: write it as YYYY-MM-DD (for example 2027-03-31)` }
  return { problem: `${column}: "${raw.slice(0, 40)}" is not a date (YYYY-MM-DD)` }
}
