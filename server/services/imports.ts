// CSV import (lead): upload → a preview of every row as it will land, with problems per row
// and column in the user's words → the lead confirms by sending the same file again, which is
// checked again and written in one transaction (any late refusal rolls the whole file back).
// Nothing is written by a preview. The columns are those of the matching export (moulds:
// server/api/moulds/export.get.ts), so an exported file imports as it is; templates are that
// header with one invented example row. Kinds: IMPORT_KINDS (moulds, plaster lots, plaster
// grades, benches, clients with their contacts, client sites, open jobs with their items). A
// column with a unit (cavity (L), length (m)…) is also read under the header an imperial
// workshop's export writes (cavity (US gal), length (in)) and converted to metric before the
// row is checked (shared/utils/units-display.ts, NIST SP 811 factors), so the preview shows
// the row as it will be stored. The kinds Setline had no export for (grades, benches,
// clients, sites, open jobs) export through `exportKind` with the very columns they import.
import { shellLitres } from '#shared/utils/plaster-fibrous'
import type { Knex } from 'knex'
import { profilesRepo } from '../repos/profiles'
import type { ZodType } from 'zod'
import type { ImportPreview, ImportProblem, ImportResult, ImportRowPreview } from '#shared/types/imports'
import type { ImportKind } from '#shared/utils/import-schemas'
import { mouldsRepo } from '../repos/moulds'
import { benchesRepo } from '../repos/benches'
import { lotsRepo } from '../repos/plaster-lots'
import { gradesRepo } from '../repos/plaster-grades'
import { clientOrgsRepo } from '../repos/client-orgs'
import { clientContactsRepo } from '../repos/client-contacts'
import { clientSitesRepo } from '../repos/client-sites'
import { jobsRepo, type JobInput } from '../repos/jobs'
import { jobItemsRepo, type ItemColumns } from '../repos/job-items'
import { workshopsRepo } from '../repos/workshops'
import { ratesRepo } from '../repos/rates'
import { MoneyInputError, parseMoney } from '#shared/utils/money'
import { contactsExport, openJobsExport, sitesExport } from '../queries/import-exports'
import { decodeCsvFile, parseCsvText, readDayCell, readNumberCell } from '../utils/csv-read'
import { UNIT_LABELS, fromDisplay, toDisplay, type UnitSystem } from '#shared/utils/units-display'
import { PlasterInputError } from '#shared/utils/plaster-core'
import type { PlasterGradePresetKey } from '#shared/utils/plaster-presets'
import { contactCreateSchema, siteCreateSchema } from '#shared/utils/client-schemas'

/**
 * A column as the file names it. `quantity`: the header's unit is the metric one of that
 * quantity (cavity (L)); the imperial export's header (cavity (US gal)) is read too and its
 * figures converted. `list`: figures separated by spaces or + (a run's walls).
 */
interface Column { header: string; field?: string; number?: boolean; required?: boolean; quantity?: 'volume' | 'length' | 'mass' | 'area' | 'thickness'; list?: boolean }
type Cells = Record<string, string | number | boolean | null>

interface KindSpec<V> {
  columns: Column[]
  example: Record<string, string>
  /** Checks every row (cells by header); returns each row's value or its problems. */
  check: (workshopId: number, rows: { line: number; cells: Record<string, string> }[]) => Promise<{ value?: V; problems: ImportProblem[] }[]>
  write: (trx: Knex, workshopId: number, actorId: number, values: V[]) => Promise<void>
  /** The kind's export rows, by header, figures metric (kinds whose export lives elsewhere have none). */
  exportRows?: (db: Knex, workshopId: number) => Promise<Cells[]>
  /** The unique constraints a late write may hit, in the user's words. */
  unique?: Record<string, string>
}

/** The same header with the imperial unit in place of the metric one, e.g. cavity (US gal). */
function imperialHeader(c: Column) {
  return c.quantity ? c.header.replace(`(${UNIT_LABELS.metric[c.quantity]})`, `(${UNIT_LABELS.imperial[c.quantity]})`) : c.header
}
const round6 = (v: number) => Number(v.toFixed(6))

/** A yes/no cell: '' is `empty`; anything else but yes or no is a problem. */
function yesNo(cells: Record<string, string>, header: string, empty: boolean, problems: ImportProblem[]): boolean {
  const w = (cells[header] ?? '').toLowerCase()
  if (w === '') return empty
  if (['yes', 'y', 'true'].includes(w)) return true
  if (['no', 'n', 'false'].includes(w)) return false
  problems.push({ column: header, message: `${header} must be yes or no` })
  return empty
}

/** Notes duplicates of `key` within the file (first line kept) and against Setline's own. */
function duplicates(what: string, column: string, taken: (key: string) => boolean, inSetline: string) {
  const firstLine = new Map<string, number>()
  return (key: string, shown: string, line: number, problems: ImportProblem[]) => {
    if (!key) return
    if (taken(key)) problems.push({ column, message: `${what} ${shown} ${inSetline}` })
    else if (firstLine.has(key)) problems.push({ column, message: `${what} ${shown} appears twice in this file (also line ${firstLine.get(key)})` })
    else firstLine.set(key, line)
  }
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
  { header: 'cavity (L)', field: 'cavityLitres', number: true, quantity: 'volume' }, { header: 'cast length (m)', field: 'castLengthM', number: true, quantity: 'length' },
  { header: 'prep (min)', field: 'prepMinutes', number: true }, { header: 'clean-out (min)', field: 'cleanMinutes', number: true },
  { header: 'maximum dwell (min)', field: 'maxDwellMinutes', number: true }, { header: 'pulls', field: 'pulls', number: true },
  { header: 'expected pulls', field: 'expectedPulls', number: true }, { header: 'state', field: 'state' }, { header: 'state reason', field: 'stateReason' },
  // a multi-cavity mould and a fibrous one (plaster-fibrous.ts); a fibrous row may leave the cavity empty
  { header: 'cavities', field: 'cavities', number: true }, { header: 'cast', field: 'castType' },
  { header: 'face area (m²)', field: 'surfaceAreaM2', number: true, quantity: 'area' }, { header: 'shell thickness (mm)', field: 'shellThicknessMm', number: true, quantity: 'thickness' },
]
type MouldValue = MouldCreateInput & { state: string; stateReason: string | null }
const materialByWord = new Map<string, string>([
  ...MOULD_MATERIALS.map(m => [m, m] as [string, string]),
  ...Object.entries(MOULD_MATERIAL_LABELS).map(([k, l]) => [l.toLowerCase(), k] as [string, string]),
])

const moulds: KindSpec<MouldValue> = {
  columns: MOULD_COLUMNS,
  example: { 'code': 'CR-101', 'casts': 'Egg-and-dart cornice, 150 mm', 'material': 'silicone', 'bench': '', 'cavity (L)': '4.2', 'cast length (m)': '1.2', 'prep (min)': '10', 'clean-out (min)': '10', 'maximum dwell (min)': '120', 'pulls': '0', 'expected pulls': '150', 'state': 'ready', 'state reason': '', 'cavities': '1', 'cast': 'solid', 'face area (m²)': '', 'shell thickness (mm)': '' },
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
        cavities: n.cavities ?? 1, castType: (cells.cast || 'solid').toLowerCase(), surfaceAreaM2: n.surfaceAreaM2 ?? null, shellThicknessMm: n.shellThicknessMm ?? null,
      }
      // a cell already refused as a number is not reported twice
      const said = new Set(problems.map(p => p.column))
      problems.push(...schemaProblems(mouldCreateSchema, input, MOULD_COLUMNS).filter(p => !said.has(p.column)))
      if (problems.length) return { problems }
      const parsed = mouldCreateSchema.parse(input)
      // a fibrous mould's cavity column holds its shell's litres (services/catalogue.ts castColumns)
      const cavityLitres = parsed.castType === 'fibrous' ? Math.round(shellLitres({ surfaceAreaM2: parsed.surfaceAreaM2!, shellThicknessMm: parsed.shellThicknessMm! }) * 1000) / 1000 : parsed.cavityLitres
      return { value: { ...parsed, cavityLitres, state, stateReason }, problems }
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
  // money in the workshop's currency as a person types it (18.50), never rounded (money.ts)
  { header: 'price per bag', field: 'pricePerBag' },
]
type LotValue = LotCreateInput & { archived: boolean }

const lots: KindSpec<LotValue> = {
  columns: LOT_COLUMNS,
  example: { 'lot code': 'L-2027-014', 'grade': 'Fibrous casting plaster', 'bags received': '40', 'bag kg': '25', 'received on': '2027-03-01', 'use by': '2027-09-01', 'archived': 'no', 'notes': '', 'price per bag': '18.50' },
  async check(workshopId, rows) {
    const db = useDb()
    const [taken, grades, rates] = await Promise.all([lotsRepo.codes(db, workshopId), gradesRepo.list(db, workshopId), ratesRepo.get(db, workshopId)])
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
      let pricePerBag: number | null = null
      const priceText = String(cells['price per bag'] ?? '').trim()
      try {
        if (priceText) pricePerBag = parseMoney(priceText, rates.currency, 'price per bag')
      }
      catch (e) {
        if (!(e instanceof MoneyInputError)) throw e
        problems.push({ column: 'price per bag', message: e.message })
      }
      const input = {
        pricePerBag, lotCode: code, gradeId: gradeId ?? 0, bagsReceived: n.bagsReceived ?? undefined, bagKg: n.bagKg ?? undefined,
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

// grades: the model's figures start from a preset (the Plasters page's starting points) and the
// file may set the consistency range, the demould time at the reference conditions and the bag
const GRADE_COLUMNS: Column[] = [
  { header: 'name', field: 'name', required: true }, { header: 'preset', field: 'presetKey', required: true },
  { header: 'bag (kg)', field: 'bagKg', number: true, required: true, quantity: 'mass' },
  { header: 'consistency min', field: 'consistencyMin', number: true }, { header: 'consistency max', field: 'consistencyMax', number: true },
  { header: 'consistency', field: 'consistency', number: true }, { header: 'demould (min)', field: 'demouldMinutesRef', number: true },
  { header: 'notes', field: 'notes' }, { header: 'archived', field: 'archived' },
]
type GradeValue = GradeCreateInput & { archived: boolean }
const presetByWord = new Map<string, PlasterGradePresetKey>([
  ...GRADE_PRESET_KEYS.map(k => [k, k] as [string, PlasterGradePresetKey]),
  ...GRADE_PRESET_KEYS.map(k => [GRADE_PRESETS[k].label.toLowerCase(), k] as [string, PlasterGradePresetKey]),
])

const grades: KindSpec<GradeValue> = {
  columns: GRADE_COLUMNS,
  example: { 'name': 'Fine casting, shop mix', 'preset': 'beta-casting', 'bag (kg)': '25', 'consistency min': '60', 'consistency max': '80', 'consistency': '70', 'demould (min)': '30', 'notes': '', 'archived': 'no' },
  async check(workshopId, rows) {
    const taken = new Set((await gradesRepo.list(useDb(), workshopId)).map(g => g.name.toLowerCase()))
    const dup = duplicates('grade', 'name', k => taken.has(k), 'is already a plaster grade in Setline')
    return rows.map(({ line, cells }) => {
      const problems: ImportProblem[] = []
      const n = numbers(GRADE_COLUMNS, cells, problems)
      const name = cells.name ?? ''
      dup(name.toLowerCase(), name, line, problems)
      const presetKey = presetByWord.get((cells.preset ?? '').toLowerCase())
      if (!cells.preset) problems.push({ column: 'preset', message: `preset is required: one of ${GRADE_PRESET_KEYS.join(', ')}, the starting point of the grade's figures` })
      else if (!presetKey) problems.push({ column: 'preset', message: `preset must be one of ${GRADE_PRESET_KEYS.join(', ')}` })
      const archived = yesNo(cells, 'archived', false, problems)
      const base = presetKey ? plasterGradeFromPreset(presetKey) : null
      const grade = base && {
        form: base.form, powderDensity: base.powderDensity, demouldMinutesRef: n.demouldMinutesRef ?? base.demouldMinutesRef,
        setTimeWaterExponent: base.setTimeWaterExponent, temperatureFactors: base.temperatureFactors, hydrationHeat: base.hydrationHeat,
        setExpansionPct: base.setExpansionPct, purity: base.purity,
        consistency: { min: n.consistencyMin ?? base.consistency.min, max: n.consistencyMax ?? base.consistency.max, default: n.consistency ?? base.consistency.default },
      }
      const input = { name, presetKey: presetKey ?? null, bagKg: n.bagKg ?? undefined, notes: cells.notes ?? null, grade }
      const said = new Set(problems.map(p => p.column))
      const parsed = gradeCreateSchema.safeParse(input)
      if (!parsed.success) {
        for (const i of parsed.error.issues) {
          // the model's nested figures are named by their column
          const path = i.path.join('.')
          const column = path === 'grade.consistency.min'
            ? 'consistency min'
            : path === 'grade.consistency.max'
              ? 'consistency max'
              : path.startsWith('grade.consistency')
                ? 'consistency'
                : path === 'grade.demouldMinutesRef'
                  ? 'demould (min)'
                  : GRADE_COLUMNS.find(c => c.field === String(i.path[0]))?.header ?? ''
          if (said.has(column) || (column === '' && !presetKey)) continue
          problems.push({ column, message: `${column || 'row'}: ${i.message.replace(/^grade\.?/, '')}` })
        }
      }
      if (problems.length || !parsed.success) return { problems }
      return { value: { ...parsed.data, archived }, problems }
    })
  },
  write: (trx, workshopId, _actorId, values) => gradesRepo.insertMany(trx, workshopId, values),
  async exportRows(db, workshopId) {
    return (await gradesRepo.list(db, workshopId)).map(g => ({
      // a grade set up by hand names the preset of its form: its other figures came from one
      'name': g.name, 'preset': g.preset_key ?? (g.form === 'alpha' ? 'alpha-casting' : 'beta-casting'), 'bag (kg)': g.bag_kg,
      'consistency min': g.consistency_min, 'consistency max': g.consistency_max, 'consistency': g.consistency_default,
      'demould (min)': g.demould_minutes_ref, 'notes': g.notes ?? '', 'archived': g.archived_at ? 'yes' : 'no',
    }))
  },
  unique: { plaster_grades_workshop_id_name_unique: 'A plaster grade name in the file was added by someone else meanwhile: preview the file again' },
}

// benches: the Benches page's fields
const BENCH_COLUMNS: Column[] = [
  { header: 'name', field: 'name', required: true }, { header: 'kind', field: 'kind', required: true },
  { header: 'length (m)', field: 'lengthM', number: true, quantity: 'length' }, { header: 'order', field: 'sortOrder', number: true },
  { header: 'archived', field: 'archived' },
]
type BenchValue = BenchCreateInput & { archived: boolean }

const benches: KindSpec<BenchValue> = {
  columns: BENCH_COLUMNS,
  example: { 'name': 'Bench 4', 'kind': 'casting', 'length (m)': '3.6', 'order': '4', 'archived': 'no' },
  async check(workshopId, rows) {
    const existing = await benchesRepo.list(useDb(), workshopId)
    const taken = new Set(existing.map(b => b.name.toLowerCase()))
    const dup = duplicates('bench', 'name', k => taken.has(k), 'is already a bench in Setline')
    let order = Math.max(0, ...existing.map(b => b.sort_order))
    return rows.map(({ line, cells }) => {
      const problems: ImportProblem[] = []
      const n = numbers(BENCH_COLUMNS, cells, problems)
      dup((cells.name ?? '').toLowerCase(), cells.name ?? '', line, problems)
      const archived = yesNo(cells, 'archived', false, problems)
      // benches without an order follow the workshop's last one, in the file's order
      const input = { name: cells.name ?? '', kind: cells.kind ?? '', lengthM: n.lengthM ?? null, sortOrder: n.sortOrder ?? ++order }
      const said = new Set(problems.map(p => p.column))
      problems.push(...schemaProblems(benchCreateSchema, input, BENCH_COLUMNS).filter(p => !said.has(p.column)))
      if (problems.length) return { problems }
      return { value: { ...benchCreateSchema.parse(input), archived }, problems }
    })
  },
  write: (trx, workshopId, _actorId, values) => benchesRepo.insertMany(trx, workshopId, values),
  async exportRows(db, workshopId) {
    return (await benchesRepo.list(db, workshopId)).map(b => ({ 'name': b.name, 'kind': b.kind, 'length (m)': b.length_m, 'order': b.sort_order, 'archived': b.archived_at ? 'yes' : 'no' }))
  },
  unique: { benches_workshop_id_name_unique: 'A bench name in the file was added by someone else meanwhile: preview the file again' },
}

// clients with their contacts: one row per contact; a client new to Setline is created from its
// first row (its notes from there), an existing client gets the file's contacts added
const CLIENT_COLUMNS: Column[] = [
  { header: 'client', required: true }, { header: 'client notes', field: 'notes' },
  { header: 'contact', field: 'name' }, { header: 'e-mail', field: 'email' }, { header: 'phone', field: 'phone' }, { header: 'role', field: 'role' },
  { header: 'progress mail', field: 'mailProgress' }, { header: 'sample mail', field: 'mailSamples' }, { header: 'dispatch mail', field: 'mailDispatch' },
  { header: 'invoice mail', field: 'mailInvoices' },
]
interface ClientValue { client: string; notes: string | null; newClient: boolean; contact: ContactCreateInput | null }

const clients: KindSpec<ClientValue> = {
  columns: CLIENT_COLUMNS,
  example: { 'client': 'Thornbury Builders', 'client notes': '', 'contact': 'Nell Thornbury', 'e-mail': 'nell@thornbury.example.test', 'phone': '+44 1632 960123', 'role': 'Site manager', 'progress mail': 'yes', 'sample mail': 'yes', 'dispatch mail': 'yes', 'invoice mail': 'yes' },
  async check(workshopId, rows) {
    const db = useDb()
    const [orgs, emails] = await Promise.all([clientOrgsRepo.idsByName(db, workshopId), clientContactsRepo.emailsByOrg(db, workshopId)])
    const seen = new Set<string>()
    const firstEmail = new Map<string, number>()
    return rows.map(({ line, cells }) => {
      const problems: ImportProblem[] = []
      const client = cells.client ?? ''
      const key = client.toLowerCase()
      if (!client) problems.push({ column: 'client', message: 'client is required' })
      else if (client.length > 160) problems.push({ column: 'client', message: 'client must be at most 160 characters' })
      const orgId = orgs.get(key)
      const newClient = !!client && !orgId && !seen.has(key)
      if (client) seen.add(key)
      const notes = cells['client notes'] || null
      if (notes && notes.length > 4000) problems.push({ column: 'client notes', message: 'client notes must be at most 4000 characters' })
      const flags = { mailProgress: yesNo(cells, 'progress mail', true, problems), mailSamples: yesNo(cells, 'sample mail', true, problems), mailDispatch: yesNo(cells, 'dispatch mail', true, problems), mailInvoices: yesNo(cells, 'invoice mail', true, problems) }
      const hasContact = ['contact', 'e-mail', 'phone', 'role'].some(h => cells[h])
      let contact: ContactCreateInput | null = null
      if (hasContact) {
        const input = { name: cells.contact ?? '', email: cells['e-mail'] ?? '', phone: cells.phone ?? null, role: cells.role ?? null, ...flags }
        const said = new Set(problems.map(p => p.column))
        problems.push(...schemaProblems(contactCreateSchema, input, CLIENT_COLUMNS).filter(p => !said.has(p.column)))
        const parsed = contactCreateSchema.safeParse(input)
        if (parsed.success) {
          contact = parsed.data
          const emailKey = `${key}\n${parsed.data.email}`
          if (orgId && emails.get(orgId)?.has(parsed.data.email)) problems.push({ column: 'e-mail', message: `${client} already has a contact with the e-mail ${parsed.data.email} in Setline` })
          else if (firstEmail.has(emailKey)) problems.push({ column: 'e-mail', message: `the e-mail ${parsed.data.email} appears twice for ${client} in this file (also line ${firstEmail.get(emailKey)})` })
          else firstEmail.set(emailKey, line)
        }
      }
      if (problems.length) return { problems }
      return { value: { client, notes, newClient, contact }, problems }
    })
  },
  async write(trx, workshopId, _actorId, values) {
    const created = await clientOrgsRepo.insertMany(trx, workshopId, values.filter(v => v.newClient).map(v => ({ name: v.client, notes: v.notes })))
    const ids = new Map([...await clientOrgsRepo.idsByName(trx, workshopId), ...created])
    await clientContactsRepo.insertMany(trx, workshopId, values.flatMap(v => (v.contact ? [{ ...v.contact, clientOrgId: ids.get(v.client.toLowerCase())! }] : [])))
  },
  async exportRows(db, workshopId) {
    const word = (b: boolean | null) => (b === null ? '' : b ? 'yes' : 'no')
    return (await contactsExport(db, workshopId)).map(r => ({
      'client': r.client, 'client notes': r.client_notes ?? '', 'contact': r.name ?? '', 'e-mail': r.email ?? '', 'phone': r.phone ?? '', 'role': r.role ?? '',
      'progress mail': word(r.mail_progress), 'sample mail': word(r.mail_samples), 'dispatch mail': word(r.mail_dispatch), 'invoice mail': word(r.mail_invoices),
    }))
  },
  unique: {
    client_orgs_workshop_id_name_unique: 'A client in the file was added by someone else meanwhile: preview the file again',
    client_contacts_org_email_unique: 'A contact in the file was added by someone else meanwhile: preview the file again',
  },
}

// sites: each names its client, which must be in Setline already (import the clients first)
const SITE_COLUMNS: Column[] = [
  { header: 'client', required: true }, { header: 'site', field: 'name', required: true }, { header: 'address', field: 'address', required: true },
  { header: 'postcode', field: 'postcode' }, { header: 'opening hours', field: 'openingHours' }, { header: 'parking', field: 'parking' }, { header: 'lifting', field: 'lifting' },
]
type SiteValue = SiteCreateInput & { clientOrgId: number }

const sites: KindSpec<SiteValue> = {
  columns: SITE_COLUMNS,
  example: { 'client': 'Thornbury Builders', 'site': 'Old Rectory', 'address': '2 Church Walk, Example Town', 'postcode': 'EX4 1RR', 'opening hours': 'Mon–Fri 08:00–16:00', 'parking': 'Drive, room for a van', 'lifting': 'Ground floor only' },
  async check(workshopId, rows) {
    const db = useDb()
    const [orgs, existing] = await Promise.all([clientOrgsRepo.idsByName(db, workshopId), clientSitesRepo.list(db, workshopId)])
    const taken = new Set(existing.map(s => `${s.client_org_id}\n${s.name.toLowerCase()}`))
    const dup = duplicates('site', 'site', k => taken.has(k), 'is already a site of this client in Setline')
    return rows.map(({ line, cells }) => {
      const problems: ImportProblem[] = []
      const orgId = orgs.get((cells.client ?? '').toLowerCase())
      if (cells.client && !orgId) problems.push({ column: 'client', message: `client "${cells.client}" is not a client of this workshop: import the clients first, or add it under Clients` })
      if (orgId && cells.site) dup(`${orgId}\n${cells.site.toLowerCase()}`, cells.site, line, problems)
      const input = { name: cells.site ?? '', address: cells.address ?? '', postcode: cells.postcode ?? null, openingHours: cells['opening hours'] ?? null, parking: cells.parking ?? null, lifting: cells.lifting ?? null }
      const said = new Set(problems.map(p => p.column))
      problems.push(...schemaProblems(siteCreateSchema, input, SITE_COLUMNS).filter(p => !said.has(p.column)))
      if (!cells.client && !said.has('client')) problems.push({ column: 'client', message: 'client is required' })
      if (problems.length) return { problems }
      return { value: { ...siteCreateSchema.parse(input), clientOrgId: orgId! }, problems }
    })
  },
  write: (trx, workshopId, _actorId, values) => clientSitesRepo.insertMany(trx, workshopId, values),
  async exportRows(db, workshopId) {
    return (await sitesExport(db, workshopId)).map(r => ({
      'client': r.client, 'site': r.name, 'address': r.address, 'postcode': r.postcode ?? '', 'opening hours': r.opening_hours ?? '', 'parking': r.parking ?? '', 'lifting': r.lifting ?? '',
    }))
  },
  unique: { client_sites_workshop_id_client_org_id_name_unique: 'A site in the file was added by someone else meanwhile: preview the file again' },
}

// open jobs with their items: one row per item, the job's own columns on each (a later row of
// the same job may leave them empty, and must not contradict the first). An item is a quantity
// of pieces, or a run: its walls through the run calculator on the mould's cast length.
const JOB_COLUMNS: Column[] = [
  { header: 'job', field: 'code', required: true }, { header: 'title', field: 'title' }, { header: 'client' }, { header: 'site' },
  { header: 'site note', field: 'site' }, { header: 'due on', field: 'dueOn' }, { header: 'sample', field: 'sampleRequired' }, { header: 'job notes', field: 'notes' },
  { header: 'item', field: 'description' }, { header: 'mould', field: 'mouldId' }, { header: 'profile', field: 'profile' },
  { header: 'quantity', field: 'quantity', number: true }, { header: 'walls (m)', field: 'walls', quantity: 'length', list: true },
  { header: 'shortest piece (m)', field: 'minPieceM', number: true, quantity: 'length' }, { header: 'spares (%)', field: 'sparesPct', number: true },
  { header: 'grade', field: 'gradeId' }, { header: 'consistency', field: 'consistency', number: true },
]
const JOB_OWN = ['title', 'client', 'site', 'site note', 'due on', 'sample', 'job notes']
interface JobValue { code: string; job: JobInput | null; item: Omit<ItemColumns, 'sort_order'> | null }

const jobs: KindSpec<JobValue> = {
  columns: JOB_COLUMNS,
  example: { 'job': 'J-2701', 'title': 'Library cornice', 'client': '', 'site': '', 'site note': 'First-floor library', 'due on': '2027-04-30', 'sample': 'no', 'job notes': '', 'item': 'Cornice run, four walls', 'mould': '', 'profile': 'Ovolo cornice 150', 'quantity': '24', 'walls (m)': '', 'shortest piece (m)': '', 'spares (%)': '', 'grade': '', 'consistency': '' },
  async check(workshopId, rows) {
    const db = useDb()
    const [taken, orgs, siteRows, moulds, gradeRows] = await Promise.all([
      jobsRepo.codes(db, workshopId), clientOrgsRepo.idsByName(db, workshopId), clientSitesRepo.list(db, workshopId),
      mouldsRepo.byCode(db, workshopId), gradesRepo.list(db, workshopId),
    ])
    const gradeByName = new Map(gradeRows.map(g => [g.name.toLowerCase(), g]))
    const siteByKey = new Map(siteRows.map(s => [`${s.client_org_id}\n${s.name.toLowerCase()}`, s.id]))
    const first = new Map<string, { line: number; cells: Record<string, string> }>()
    return rows.map(({ line, cells }) => {
      const problems: ImportProblem[] = []
      const n = numbers(JOB_COLUMNS, cells, problems)
      const code = cells.job ?? ''
      if (code && taken.has(code)) problems.push({ column: 'job', message: `job ${code} is already a job in Setline` })
      const head = first.get(code)
      let job: JobInput | null = null
      if (head) {
        for (const h of JOB_OWN) {
          if (cells[h] && cells[h] !== head.cells[h]) problems.push({ column: h, message: `${h} differs from line ${head.line} of the same job: leave it empty or write the same` })
        }
      }
      else {
        if (code) first.set(code, { line, cells })
        const orgId = cells.client ? orgs.get(cells.client.toLowerCase()) : undefined
        if (cells.client && !orgId) problems.push({ column: 'client', message: `client "${cells.client}" is not a client of this workshop: import the clients first, or add it under Clients` })
        let siteId: number | undefined
        if (cells.site) {
          if (!cells.client) problems.push({ column: 'site', message: 'a site needs its client in the client column' })
          else if (orgId) {
            siteId = siteByKey.get(`${orgId}\n${cells.site.toLowerCase()}`)
            if (!siteId) problems.push({ column: 'site', message: `site "${cells.site}" is not a site of ${cells.client}: import the sites first, or add it on the client's page` })
          }
        }
        const due = readDayCell(cells['due on'] ?? '', 'due on')
        if ('problem' in due) problems.push({ column: 'due on', message: due.problem })
        const sampleRequired = yesNo(cells, 'sample', false, problems)
        const input = { code, title: cells.title ?? '', site: cells['site note'] || (siteId ? cells.site : null), dueOn: 'value' in due ? due.value : null, notes: cells['job notes'] ?? null, sampleRequired, clientOrgId: orgId ?? null, siteId: siteId ?? null }
        const said = new Set(problems.map(p => p.column))
        problems.push(...schemaProblems(jobCreateSchema, input, JOB_COLUMNS).filter(p => !said.has(p.column)))
        if (!problems.length) job = jobCreateSchema.parse(input)
      }
      let item: JobValue['item'] = null
      const itemCells = ['item', 'mould', 'profile', 'quantity', 'walls (m)', 'shortest piece (m)', 'spares (%)', 'grade', 'consistency']
      if (itemCells.some(h => cells[h])) {
        const mould = cells.mould ? moulds.get(cells.mould) : undefined
        if (cells.mould && !mould) problems.push({ column: 'mould', message: `mould "${cells.mould}" is not a mould of this workshop: import the moulds first` })
        const grade = cells.grade ? gradeByName.get(cells.grade.toLowerCase()) : undefined
        if (cells.grade && !grade) problems.push({ column: 'grade', message: `grade "${cells.grade}" is not a plaster grade of this workshop: add it under Plasters first` })
        let walls: { lengthM: number }[] | null = null
        if (cells['walls (m)']) {
          const parts = cells['walls (m)'].split(/[\s+]+/).filter(Boolean)
          const read = parts.map(p => readNumberCell(p, 'walls (m)'))
          const bad = read.find(r => 'problem' in r)
          if (bad && 'problem' in bad) problems.push({ column: 'walls (m)', message: `${bad.problem}; separate the walls with spaces, e.g. 5.2 4.1 5.2` })
          else walls = read.map(r => ({ lengthM: (r as { value: number }).value }))
        }
        const kind = walls ? 'run' : 'pieces'
        const input = {
          kind, mouldId: mould?.id ?? null, profile: cells.profile ?? null, description: cells.item ?? '', quantity: n.quantity ?? null, walls,
          minPieceM: n.minPieceM ?? undefined, sparesPct: n.sparesPct ?? undefined, gradeId: grade?.id ?? null, consistency: n.consistency ?? null,
        }
        if (walls && n.quantity !== null && n.quantity !== undefined) problems.push({ column: 'quantity', message: 'quantity or walls (m), not both: a run\'s pieces come from its walls' })
        const said = new Set(problems.map(p => p.column))
        problems.push(...schemaProblems(jobItemCreateSchema, input, JOB_COLUMNS).filter(p => !said.has(p.column)))
        if (kind === 'run' && mould && !mould.cast_length_m && !said.has('mould')) problems.push({ column: 'mould', message: `mould ${cells.mould} has no cast length, so it cannot cast a run: give it one, or write a quantity` })
        if (!problems.length) {
          const v = jobItemCreateSchema.parse(input)
          const minPieceM = v.minPieceM ?? DEFAULT_MIN_PIECE_M
          const sparesPct = v.sparesPct ?? 0
          try {
            const pieces = itemPiecesNeeded(kind === 'run'
              ? { run: { walls: v.walls!, castLengthM: mould!.cast_length_m!, minPieceM, sparesPct } }
              : { quantity: v.quantity! }).pieces
            item = {
              // the profile is linked when the rows are written (write below), like the item form does
              mould_id: v.mouldId ?? null, profile: v.profile ?? null, profile_id: null, description: v.description, quantity: kind === 'run' ? null : v.quantity!,
              run_m: kind === 'run' ? round6(v.walls!.reduce((m, w) => m + w.lengthM, 0)) : null, walls: kind === 'run' ? JSON.stringify(v.walls) : null,
              min_piece_m: kind === 'run' ? minPieceM : null, spares_pct: kind === 'run' ? sparesPct : 0, pieces_needed: pieces,
              grade_id: v.gradeId ?? null, consistency: v.consistency ?? grade?.consistency_default ?? null,
              // the import's columns carry walls only: corners are added on the item form
              projection_m: null, saw_cut_m: null, corner_block_leg_m: null,
            }
          }
          catch (err) {
            // the run calculator's refusal (a wall shorter than the shortest piece), in its words
            if (!(err instanceof PlasterInputError)) throw err
            problems.push({ column: 'walls (m)', message: err.message })
          }
        }
      }
      else if (code && !head && !problems.length) {
        // a job alone, without items, is fine (its items can follow on later rows or in Setline)
      }
      if (problems.length) return { problems }
      return { value: { code, job, item }, problems }
    })
  },
  async write(trx, workshopId, _actorId, values) {
    const ids = await jobsRepo.insertMany(trx, workshopId, values.flatMap(v => (v.job ? [v.job] : [])))
    // an item naming a profile the workshop has is linked to it (as the job item form does)
    const profileIds = new Map<string, number | null>()
    for (const name of new Set(values.flatMap(v => (v.item?.profile ? [v.item.profile] : [])))) {
      profileIds.set(name, await profilesRepo.find(trx, workshopId, name))
    }
    for (const v of values) if (v.item?.profile) v.item.profile_id = profileIds.get(v.item.profile) ?? null
    const order = new Map<number, number>()
    await jobItemsRepo.insertMany(trx, workshopId, values.flatMap((v) => {
      if (!v.item) return []
      const jobId = ids.get(v.code)!
      order.set(jobId, (order.get(jobId) ?? 0) + 1)
      return [{ ...v.item, job_id: jobId, sort_order: order.get(jobId)! }]
    }))
  },
  async exportRows(db, workshopId) {
    const seen = new Set<string>()
    return (await openJobsExport(db, workshopId)).map((r) => {
      // the job's own columns on its first row only, as a person would write the sheet
      const own = !seen.has(r.code)
      seen.add(r.code)
      return {
        'job': r.code, 'title': own ? r.title : '', 'client': own ? r.client ?? '' : '', 'site': own ? r.site ?? '' : '',
        'site note': own ? r.site_note ?? '' : '', 'due on': own ? r.due_on ?? '' : '', 'sample': own ? (r.sample_required ? 'yes' : 'no') : '',
        'job notes': own ? r.notes ?? '' : '', 'item': r.description ?? '', 'mould': r.mould ?? '', 'profile': r.profile ?? '',
        'quantity': r.walls ? null : r.quantity, 'walls (m)': r.walls ? r.walls.map(w => w.lengthM).join(' ') : '',
        'shortest piece (m)': r.walls ? r.min_piece_m : null, 'spares (%)': r.walls ? r.spares_pct : null, 'grade': r.grade ?? '', 'consistency': r.consistency,
      }
    })
  },
  unique: { jobs_workshop_id_code_unique: 'A job code in the file was added by someone else meanwhile: preview the file again' },
}

interface Kinds {
  moulds: KindSpec<MouldValue>
  lots: KindSpec<LotValue>
  grades: KindSpec<GradeValue>
  benches: KindSpec<BenchValue>
  clients: KindSpec<ClientValue>
  sites: KindSpec<SiteValue>
  jobs: KindSpec<JobValue>
}
const KINDS: Kinds = { moulds, lots, grades, benches, clients, sites, jobs }
function spec(kind: ImportKind) {
  // each kind's rows are checked and written by that kind alone
  return KINDS[kind] as unknown as KindSpec<unknown>
}

/** The template's columns and example row (GET /api/import/[kind]/template). */
export function importTemplate(kind: ImportKind) {
  const { columns, example } = spec(kind)
  return { columns: columns.map(c => ({ key: c.header, header: c.header, number: c.number })), example }
}

/**
 * An imperial cell as the metric figure it will be stored as; a cell that is not a plain figure
 * (or list of figures) is left for the kind's check to name.
 */
function toMetricCell(raw: string, c: Column): string {
  const parts = c.list ? raw.split(/[\s+]+/).filter(Boolean) : [raw]
  if (!raw || parts.some(p => !/^-?\d+(\.\d+)?$/.test(p))) return raw
  return parts.map(p => String(round6(fromDisplay[c.quantity!](Number(p), 'imperial')))).join(' ')
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
  const imperial = new Set<string>()
  for (const c of kindSpec.columns.filter(c => c.quantity)) {
    const alt = imperialHeader(c).toLowerCase()
    known.set(alt, c.header)
    if (parsed.header.some(h => h.toLowerCase() === alt)) imperial.add(c.header)
  }
  const unknown = parsed.header.filter(h => h && !known.has(h.toLowerCase()))
  const missing = kindSpec.columns.filter(c => c.required && !parsed.header.some(h => known.get(h.toLowerCase()) === c.header)).map(c => c.header)
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
  for (const c of kindSpec.columns.filter(c => imperial.has(c.header))) {
    for (const r of rows) r.cells[c.header] = toMetricCell(r.cells[c.header] ?? '', c)
  }
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
      ...spec(kind).unique,
    })
  }
  return { kind, imported: values.length }
}

/**
 * A kind's export with its import's columns: figures in the workshop's units, the unit in the
 * header (an imperial workshop's file says length (in) and the import reads it back).
 */
export async function exportKind(workshopId: number, kind: ImportKind): Promise<{ rows: Cells[]; columns: { key: string; header: string; number?: boolean }[] }> {
  const db = useDb()
  const k = spec(kind)
  const u: UnitSystem = (await workshopsRepo.get(db, workshopId))?.units ?? 'metric'
  const rows = k.exportRows ? await k.exportRows(db, workshopId) : []
  const units = k.columns.filter(c => c.quantity)
  if (u === 'imperial') {
    for (const r of rows) {
      for (const c of units) {
        const v = r[c.header]
        if (typeof v === 'number') r[c.header] = round6(toDisplay[c.quantity!](v, u))
        else if (typeof v === 'string' && c.list && v) r[c.header] = v.split(' ').map(x => String(round6(toDisplay[c.quantity!](Number(x), u)))).join(' ')
      }
    }
  }
  return { rows, columns: k.columns.map(c => ({ key: c.header, header: u === 'imperial' ? imperialHeader(c) : c.header, number: c.number })) }
}
