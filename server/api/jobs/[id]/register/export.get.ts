// A job's casting register as CSV (lead), with the page's filters. Streamed: rows are read in
// keyset pages and flow through csv-stringify, so a 100,000-pour job never sits in memory.
import { registerExport } from '../../../../queries/register'

const COLUMNS: [string, string][] = [
  ['pourId', 'pour'], ['state', 'pour state'], ['isSample', 'sample'], ['mark', 'piece mark'], ['pieceState', 'piece state'],
  ['item', 'item'], ['mould', 'mould'], ['grade', 'grade'], ['lot', 'lot'], ['consistency', 'consistency (water per 100 plaster)'],
  ['plasterKgActual', 'plaster kg'], ['waterKgActual', 'water kg'], ['waterTempC', 'water °C'], ['powderTempC', 'powder °C'],
  ['shopTempC', 'shop °C'], ['slurryTempC', 'slurry °C'], ['mixPlanned', 'mix planned'], ['mixingAt', 'mixing'],
  ['pouredAt', 'poured'], ['demouldOpen', 'demould window opens'], ['demouldClose', 'demould window closes'],
  ['demouldedAt', 'demoulded'], ['caster', 'caster'], ['result', 'result'], ['defect', 'defect'], ['photos', 'photos'],
  ['backdated', 'back-dated'],
]

const TIMES = new Set(['mixPlanned', 'mixingAt', 'pouredAt', 'demouldOpen', 'demouldClose', 'demouldedAt'])
/** Figures: a negative temperature stays a number in the spreadsheet (server/utils/csv.ts). */
const FIGURES = new Set(['pourId', 'consistency', 'plasterKgActual', 'waterKgActual', 'waterTempC', 'powderTempC', 'shopTempC', 'slurryTempC', 'photos'])

export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  const { id } = validParams(event, idParamSchema)
  const filter = validQuery(event, registerFilterSchema)
  const { job, timezone, rows } = await registerExport(actor.workshopId, id, filter)
  // times are local to the workshop: the header names the zone so the file stands alone
  const columns = COLUMNS.map(([key, header]) => ({ key, header: TIMES.has(key) ? `${header} (${timezone})` : header, number: FIGURES.has(key) }))
  return sendCsvRows(event, `setline-${job.code}-register.csv`, rows, columns)
})
