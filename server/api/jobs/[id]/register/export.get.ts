// A job's casting register as CSV (lead), with the page's filters. Streamed: rows are read in
// keyset pages and flow through csv-stringify, so a 100,000-pour job never sits in memory.
// Weights and temperatures in the workshop's units, the header naming the unit.
import { registerExport } from '../../../../queries/register'
import { UNIT_LABELS, displayNumber, type UnitSystem } from '#shared/utils/units-display'

const COLUMNS: [string, string][] = [
  ['pourId', 'pour'], ['state', 'pour state'], ['isSample', 'sample'], ['mark', 'piece marks'], ['pieceState', 'piece state'],
  ['item', 'item'], ['mould', 'mould'], ['cavities', 'pieces per pour'], ['grade', 'grade'], ['lot', 'lot'], ['consistency', 'consistency (water per 100 plaster)'],
  ['plasterKgActual', 'plaster mass'], ['waterKgActual', 'water mass'], ['waterTempC', 'water temp'], ['powderTempC', 'powder temp'],
  ['shopTempC', 'shop temp'], ['slurryTempC', 'slurry temp'], ['mixPlanned', 'mix planned'], ['mixingAt', 'mixing'],
  ['pouredAt', 'poured'], ['demouldOpen', 'demould window opens'], ['demouldClose', 'demould window closes'],
  ['demouldedAt', 'demoulded'], ['caster', 'caster'], ['result', 'result'], ['defect', 'defect'], ['photos', 'photos'],
  ['backdated', 'back-dated'],
]

const TIMES = new Set(['mixPlanned', 'mixingAt', 'pouredAt', 'demouldOpen', 'demouldClose', 'demouldedAt'])
/** Figures: a negative temperature stays a number in the spreadsheet (server/utils/csv.ts). */
const FIGURES = new Set(['pourId', 'cavities', 'consistency', 'plasterKgActual', 'waterKgActual', 'waterTempC', 'powderTempC', 'shopTempC', 'slurryTempC', 'photos'])

const MASSES = ['plasterKgActual', 'waterKgActual'] as const
const TEMPS = ['waterTempC', 'powderTempC', 'shopTempC', 'slurryTempC'] as const

function unitOf(key: string, u: UnitSystem): string | null {
  if ((MASSES as readonly string[]).includes(key)) return UNIT_LABELS[u].mass
  if ((TEMPS as readonly string[]).includes(key)) return UNIT_LABELS[u].temp
  return null
}

/** Imperial rows converted as they stream; metric rows pass untouched (the stored figures). */
async function* inUnits(rows: AsyncIterable<Record<string, unknown>>, u: UnitSystem) {
  for await (const r of rows) {
    if (u === 'metric') {
      yield r
      continue
    }
    const out: Record<string, unknown> = { ...r }
    const conv = (key: string, q: 'mass' | 'temp', digits: number) => {
      if (r[key] !== null && r[key] !== undefined && r[key] !== '') out[key] = displayNumber(q, Number(r[key]), u, digits)
    }
    for (const k of MASSES) conv(k, 'mass', 2)
    for (const k of TEMPS) conv(k, 'temp', 1)
    yield out
  }
}

export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  const { id } = validParams(event, idParamSchema)
  const filter = validQuery(event, registerFilterSchema)
  const { job, timezone, units, rows } = await registerExport(actor.workshopId, id, filter)
  // times are local to the workshop: the header names the zone so the file stands alone
  const columns = COLUMNS.map(([key, header]) => ({ key, header: TIMES.has(key) ? `${header} (${timezone})` : unitOf(key, units) ? `${header} (${unitOf(key, units)})` : header, number: FIGURES.has(key) }))
  return sendCsvRows(event, `setline-${job.code}-register.csv`, inUnits(rows, units), columns)
})
