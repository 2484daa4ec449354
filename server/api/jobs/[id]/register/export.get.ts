// A job's casting register as CSV (lead), with the page's filters. Streamed: rows are read in
// keyset pages and flow through csv-stringify, so a 100,000-pour job never sits in memory.
import { registerExport } from '../../../../queries/register'

const COLUMNS: [string, string][] = [
  ['pour_id', 'pour'], ['state', 'pour state'], ['is_sample', 'sample'], ['mark', 'piece mark'], ['piece_state', 'piece state'],
  ['item', 'item'], ['mould', 'mould'], ['grade', 'grade'], ['lot', 'lot'], ['consistency', 'consistency (water per 100 plaster)'],
  ['plaster_kg_actual', 'plaster kg'], ['water_kg_actual', 'water kg'], ['water_temp_c', 'water °C'], ['powder_temp_c', 'powder °C'],
  ['shop_temp_c', 'shop °C'], ['slurry_temp_c', 'slurry °C'], ['mix_planned', 'mix planned'], ['mixing_at', 'mixing'],
  ['poured_at', 'poured'], ['demould_open', 'demould window opens'], ['demould_close', 'demould window closes'],
  ['demoulded_at', 'demoulded'], ['caster', 'caster'], ['result', 'result'], ['defect', 'defect'], ['photos', 'photos'],
  ['backdated', 'back-dated'],
]

const TIMES = new Set(['mix_planned', 'mixing_at', 'poured_at', 'demould_open', 'demould_close', 'demoulded_at'])
/** Figures: a negative temperature stays a number in the spreadsheet (server/utils/csv.ts). */
const FIGURES = new Set(['pour_id', 'consistency', 'plaster_kg_actual', 'water_kg_actual', 'water_temp_c', 'powder_temp_c', 'shop_temp_c', 'slurry_temp_c', 'photos'])

export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  const { id } = validParams(event, idParamSchema)
  const filter = validQuery(event, registerFilterSchema)
  const { job, timezone, rows } = await registerExport(actor.workshopId, id, filter)
  // times are local to the workshop: the header names the zone so the file stands alone
  const columns = COLUMNS.map(([key, header]) => ({ key, header: TIMES.has(key) ? `${header} (${timezone})` : header, number: FIGURES.has(key) }))
  return sendCsvRows(event, `setline-${job.code}-register.csv`, rows, columns)
})
