// The day sheet as CSV (lead, caster), through the shared sender (server/utils/csv.ts: formula
// escaping, BOM): one row per pour, then one per grade of the requisition. Times in the
// workshop's zone, as on the wall.
import { daySheet } from '../../queries/day-sheet'

const text = (key: string) => ({ key, header: key })
const figure = (key: string) => ({ key, header: key, number: true })
const COLUMNS = [text('section'), text('bench'), text('mould'), figure('casts'), text('job'), text('item'), text('caster'), text('mix'),
  text('demould_open'), text('demould_close'), text('grade'), figure('consistency'), figure('plaster_kg'), figure('water_kg'), figure('bags'), text('lot_to_open')]

export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead', 'caster')
  const { day } = validQuery(event, daySheetQuerySchema)
  const sheet = await daySheet(actor.workshopId, day)
  const at = (iso: string) => boardClock(new Date(iso), sheet.timezone).slice(11)
  const rows: Record<string, unknown>[] = []
  for (const b of sheet.benches) {
    for (const p of b.pours) {
      rows.push({ section: 'pour', bench: b.benchName ?? '', mould: p.mouldCode, casts: p.casts, job: p.jobCode ?? '', item: p.itemDescription ?? '',
        caster: p.casterName ?? '', mix: at(p.mixAt), demould_open: at(p.demouldOpenAt), demould_close: at(p.demouldCloseAt),
        grade: p.gradeName, consistency: p.consistency, plaster_kg: p.plasterKg.toFixed(2), water_kg: p.waterKg.toFixed(2) })
    }
  }
  for (const r of sheet.requisition) {
    rows.push({ section: 'requisition', grade: r.gradeName, plaster_kg: r.plasterKg.toFixed(2), water_kg: r.waterLitres.toFixed(2), bags: r.bags, lot_to_open: r.lotToOpen?.lotCode ?? '' })
  }
  return sendCsvRows(event, `day-sheet-${day}.csv`, rows, COLUMNS)
})
