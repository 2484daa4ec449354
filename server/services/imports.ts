// CSV import (lead): upload → a preview of every row as it will land, with problems per row
// and column in the user's words → the lead confirms by sending the same file again, which is
// checked again and written in one transaction (any late refusal rolls the whole file back).
// Nothing is written by a preview. The columns are those of the matching export (moulds:
// server/api/moulds/export.get.ts), so an exported file imports as it is; templates are that
// header with one invented example row. Kinds: IMPORT_KINDS (moulds, plaster lots).
import type { Knex } from 'knex'
import type { ZodType } from 'zod'
import type { ImportPreview, ImportProblem, ImportResult, ImportRowPreview } from '#shared/types/imports'
import type { ImportKind } from '#shared/utils/import-schemas'
import { mouldsRepo } from '../repos/moulds'
import { benchesRepo } from '../repos/benches'
import { lotsRepo } from '../repos/plaster-lots'
import { gradesRepo } from '../repos/plaster-grades'
import { decodeCsvFile, parseCsvText, readDayCell, readNumberCell } from '../utils/csv-read'

interface Column { header: string; field?: string; number?: boolean; required?: boolean }

interface KindSpec<V> {
  columns: Column[]
  example: Record<string, string>
  /** Checks every row (cells by header); returns each row's value or its problems. */
  check: (workshopId: number, rows: { line: number; cells: Record<string, string> }[]) => Promise<{ value?: V; problems: ImportProblem[] }[]>
  write: (trx: Knex, workshopId: number, actorId: number, values: V[]) => Promise<void>
}

/** zod messages name the schema's field; the person knows the column's header. */
function schemaProblems(schema: ZodType, input: unknown, columns: Column[]): ImportProblem[] {
  const parsed = schema.safeParse(input)
  if (parsed.success) return []
  return parsed.error.issues.map((i) => {
    const col = columns.find(c => c.field === String(i.path[0] ?? ''))
    // every field a message names (a refinement may name two) in the file's own words
    const message = columns.reduce((m, c) => (c.field ? m.replaceAll(c.field, c.header) : m), i.message)
    return { column: col?.header ?? '', message }
  })
}

/** Reads the number columns of a row; problems for cells that are not plain figures. */
function numbers(columns: Column[], cells: Record<string, string>, problems: ImportProblem[]) {
  const out: Record<string, number | null> = {}
  for (const c of columns.filter(c => c.number)) {
    const r = readNumberCell(cells[c.header] ?? '', c.header)
    if ('problem' in r) problems.push({ column: c.header, message: r.problem })
    else out[c.field!] = r.value
  }
  return out
}

const MOULD_COLUMNS: Column[] = [
  { header: 'code', field: 'code', required: true }, { header: 'casts', field: 'casts', required: true },
  { header: 'material', field: 'material', required: true }, { header: 'bench', field: 'benchId' },
  { header: 'cavity (L)', field: 'cavityLitres', number: true, required: true }, { header: 'cast length (m)', field: 'castLengthM', number: true },
  { header: 'prep (min)', field: 'prepMinutes', number: true }, { header: 'clean-out (min)', field: 'cleanMinutes', number: true },
  { header: 'maximum dwell (min)', field: 'maxDwellMinutes', number: true }, { header: 'pulls', field: 'pulls', number: true },
  { header: 'expected pulls', field: 'expectedPulls', number: true }, { header: 'state', field: 'state' }, { header: 'state reason', field: 'stateReason' },
]
type MouldValue = MouldCreateInput & { state: string; stateReason: string | null }
const materialByWord = new Map<string, string>([
  ...MOULD_MATERIALS.map(m => [m, m] as [string, string]),
  ...Object.entries(MOULD_MATERIAL_LABELS).map(([k, l]) => [l.toLowerCase(), k] as [string, string]),
])

const moulds: KindSpec<MouldValue> = {
  columns: MOULD_COLUMNS,
  example: { 'code': 'CR-101', 'casts': 'Egg-and-dart cornice, 150 mm', 'material': 'silicone', 'bench': '', 'cavity (L)': '4.2', 'cast length (m)': '1.2', 'prep (min)': '10', 'clean-out (min)': '10', 'maximum dwell (min)': '120', 'pulls': '0', 'expected pulls': '150', 'state': 'ready', 'state reason': '' },
  async check(workshopId, rows) {
    const db = useDb()
    const [taken, benches] = await Promise.all([mouldsRepo.codes(db, workshopId), benchesRepo.list(db, workshopId)])
    const benchByName = new Map(benches.map(b => [b.name.toLowerCase(), b.id]))
    const firstLine = new Map<string, number>()
    return rows.map(({ line, cells }) => {
      const problems: ImportProblem[] = []
      const n = numbers(MOULD_COLUMNS, cells, problems)
      const code = cells.code ?? ''
      if (code && taken.has(code)) problems.push({ column: 'code', message: `code ${code} is already a mould in Setline` })
      else if (code && firstLine.has(code)) problems.push({ column: 'code', message: `code ${code} appears twice in this file (also line ${firstLine.get(code)})` })
      else if (code) firstLine.set(code, line)
      const materialWord = (cells.material ?? '').toLowerCase()
      const material = materialByWord.get(materialWord) ?? materialByWord.get(materialWord.replace(/[\s-]+/g, '_')) ?? cells.material
      let benchId: number | null = null
      if (cells.bench) {
        benchId = benchByName.get(cells.bench.toLowerCase()) ?? null
        if (!benchId) problems.push({ column: 'bench', message: `bench "${cells.bench}" is not a bench of this workshop: add it under Benches first, or leave the cell empty` })
      }
      const state = (cells.state || 'ready').toLowerCase().replace(/\s+/g, '_')
      if (!(MOULD_STATES as readonly string[]).includes(state)) problems.push({ column: 'state', message: `state must be one of ${MOULD_STATES.join(', ')}` })
      const stateReason = cells['state reason'] || null
      if ((state === 'repair' || state === 'retired') && !stateReason) problems.push({ column: 'state reason', message: 'state reason is required for a mould in repair or retired' })
      const input = {
        code, casts: cells.casts ?? '', material, benchId, cavityLitres: n.cavityLitres ?? undefined, castLengthM: n.castLengthM ?? null,
        prepMinutes: n.prepMinutes ?? 10, cleanMinutes: n.cleanMinutes ?? 10, maxDwellMinutes: n.maxDwellMinutes ?? 120, pulls: n.pulls ?? 0, expectedPulls: n.expectedPulls ?? null,
      }
      // a cell already refused as a number is not reported twice
      const said = new Set(problems.map(p => p.column))
      problems.push(...schemaProblems(mouldCreateSchema, input, MOULD_COLUMNS).filter(p => !said.has(p.column)))
      if (problems.length) return { problems }
      return { value: { ...mouldCreateSchema.parse(input), state, stateReason }, problems }
    })
  },
  write: (trx, workshopId, actorId, values) => mouldsRepo.insertMany(trx, workshopId, actorId, values),
}

// lots: the columns of server/api/lots/export.get.ts; the grade by its name in this workshop
const LOT_COLUMNS: Column[] = [
  { header: 'lot code', field: 'lotCode', required: true }, { header: 'grade', field: 'gradeId', required: true },
  { header: 'bags received', field: 'bagsReceived', number: true, required: true }, { header: 'bag kg', field: 'bagKg', number: true, required: true },
  { header: 'received on', field: 'receivedOn', required: true }, { header: 'use by', field: 'useBy' },
  { header: 'archived', field: 'archived' }, { header: 'notes', field: 'notes' },
]
type LotValue = LotCreateInput & { archived: boolean }

const lots: KindSpec<LotValue> = {
  columns: LOT_COLUMNS,
  example: { 'lot code': 'L-2027-014', 'grade': 'Fibrous casting plaster', 'bags received': '40', 'bag kg': '25', 'received on': '2027-03-01', 'use by': '2027-09-01', 'archived': 'no', 'notes': '' },
  async check(workshopId, rows) {
    const db = useDb()
    const [taken, grades] = await Promise.all([lotsRepo.codes(db, workshopId), gradesRepo.list(db, workshopId)])
    const gradeByName = new Map(grades.map(g => [g.name.toLowerCase(), g.id]))
    const firstLine = new Map<string, number>()
    return rows.map(({ line, cells }) => {
      const problems: ImportProblem[] = []
      const n = numbers(LOT_COLUMNS, cells, problems)
      const code = cells['lot code'] ?? ''
      if (code && taken.has(code)) problems.push({ column: 'lot code', message: `lot code ${code} is already a lot in Setline` })
      else if (code && firstLine.has(code)) problems.push({ column: 'lot code', message: `lot code ${code} appears twice in this file (also line ${firstLine.get(code)})` })
      else if (code) firstLine.set(code, line)
      const gradeId = gradeByName.get((cells.grade ?? '').toLowerCase())
      if (cells.grade && !gradeId) problems.push({ column: 'grade', message: `grade "${cells.grade}" is not a plaster grade of this workshop: add it under Plasters first` })
      const days: Record<string, string | null> = {}
      for (const [header, field] of [['received on', 'receivedOn'], ['use by', 'useBy']] as const) {
        const r = readDayCell(cells[header] ?? '', header)
        if ('problem' in r) problems.push({ column: header, message: r.problem })
        else days[field] = r.value
      }
      const archivedWord = (cells.archived ?? '').toLowerCase()
      if (!['', 'yes', 'no'].includes(archivedWord)) problems.push({ column: 'archived', message: 'archived must be yes or no' })
      const input = {
        lotCode: code, gradeId: gradeId ?? 0, bagsReceived: n.bagsReceived ?? undefined, bagKg: n.bagKg ?? undefined,
        receivedOn: days.receivedOn ?? undefined, useBy: days.useBy ?? null, notes: cells.notes ?? null,
      }
      const said = new Set(problems.map(p => p.column))
      problems.push(...schemaProblems(lotCreateSchema, input, LOT_COLUMNS).filter(p => !said.has(p.column)))
      if (problems.length) return { problems }
      return { value: { ...lotCreateSchema.parse(input), archived: archivedWord === 'yes' }, problems }
    })
  },
  write: (trx, workshopId, _actorId, values) => lotsRepo.insertMany(trx, workshopId, values),
}

interface Kinds { moulds: KindSpec<MouldValue>; lots: KindSpec<LotValue> }
const KINDS: Kinds = { moulds, lots }
function spec(kind: ImportKind) {
  // each kind's rows are checked and written by that kind alone
  return KINDS[kind] as unknown as KindSpec<unknown>
}

/** The template's columns and example row (GET /api/import/[kind]/template). */
export function importTemplate(kind: ImportKind) {
  const { columns, example } = spec(kind)
  return { columns: columns.map(c => ({ key: c.header, header: c.header, number: c.number })), example }
}

async function checkFile(workshopId: number, kind: ImportKind, fileName: string, bytes: Buffer) {
  const kindSpec = spec(kind)
  const columns = kindSpec.columns.map(c => c.header)
  const preview: ImportPreview = { kind, fileName, columns, fileProblems: [], rows: [], rowCount: 0, problemRows: 0, ready: false }
  const decoded = decodeCsvFile(bytes)
  if ('problem' in decoded) return { preview: { ...preview, fileProblems: [decoded.problem] }, values: [] }
  const parsed = parseCsvText(decoded.text)
  if ('problem' in parsed) return { preview: { ...preview, fileProblems: [parsed.problem] }, values: [] }
  const known = new Map(columns.map(c => [c.toLowerCase(), c]))
  const unknown = parsed.header.filter(h => h && !known.has(h.toLowerCase()))
  const missing = kindSpec.columns.filter(c => c.required && !parsed.header.some(h => h.toLowerCase() === c.header.toLowerCase())).map(c => c.header)
  if (unknown.length) preview.fileProblems.push(`Column${unknown.length > 1 ? 's' : ''} ${unknown.map(u => `"${u}"`).join(', ')} ${unknown.length > 1 ? 'are' : 'is'} not one Setline knows for ${kind}: the columns are ${columns.join(', ')} (download the template)`)
  if (missing.length) preview.fileProblems.push(`Column${missing.length > 1 ? 's' : ''} ${missing.map(m => `"${m}"`).join(', ')} ${missing.length > 1 ? 'are' : 'is'} missing`)
  if (!parsed.records.length) preview.fileProblems.push('The file has a header but no rows')
  if (preview.fileProblems.length) return { preview, values: [] }
  const headerAt = parsed.header.map(h => known.get(h.toLowerCase()))
  const rows = parsed.records.map(r => ({
    line: r.line,
    cells: Object.fromEntries(headerAt.flatMap((h, i) => (h ? [[h, r.cells[i] ?? '']] : []))) as Record<string, string>,
    extra: r.cells.length > parsed.header.length,
  }))
  const checked = await kindSpec.check(workshopId, rows)
  preview.rows = rows.map((r, i): ImportRowPreview => ({
    line: r.line, cells: r.cells,
    problems: [...(r.extra ? [{ column: '', message: `this row has more cells than the header has columns (${parsed.header.length})` }] : []), ...checked[i]!.problems],
  }))
  preview.rowCount = preview.rows.length
  preview.problemRows = preview.rows.filter(r => r.problems.length).length
  preview.ready = preview.problemRows === 0
  return { preview, values: checked.flatMap(c => (c.value === undefined ? [] : [c.value])) }
}

/** The preview: every row as it will land, with its problems; nothing is written. */
export async function previewImport(workshopId: number, kind: ImportKind, fileName: string, bytes: Buffer): Promise<ImportPreview> {
  return (await checkFile(workshopId, kind, fileName, bytes)).preview
}

/** Checks the file again and writes every row in one transaction; 422 with the preview when any row has a problem. */
export async function confirmImport(workshopId: number, actorId: number, kind: ImportKind, fileName: string, bytes: Buffer): Promise<ImportResult> {
  const { preview, values } = await checkFile(workshopId, kind, fileName, bytes)
  if (!preview.ready) {
    const first = preview.fileProblems[0] ?? preview.rows.find(r => r.problems.length)?.problems[0]?.message
    throw createError({ statusCode: 422, message: `Nothing was imported: ${first ?? 'the file has problems'}`, data: { preview } })
  }
  try {
    await useDb().transaction(trx => spec(kind).write(trx, workshopId, actorId, values))
  }
  catch (err) {
    rethrowDbError(err, {
      moulds_workshop_id_code_unique: 'A mould code in the file was added by someone else meanwhile: preview the file again',
      plaster_lots_workshop_id_lot_code_unique: 'A lot code in the file was added by someone else meanwhile: preview the file again',
    })
  }
  return { kind, imported: values.length }
}
