// The day sheet as CSV (lead, caster), streamed through csv-stringify: one row per pour,
// then one per grade of the requisition. Times in the workshop's zone, as on the wall.
import { stringify } from 'csv-stringify'
import { daySheet } from '../../services/day-sheet'
import { loadWorkshop } from '../../services/pours'

export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead', 'caster')
  const { day } = validQuery(event, daySheetQuerySchema)
  const [sheet, ws] = await Promise.all([daySheet(actor.workshopId, day), loadWorkshop(useDb(), actor.workshopId)])
  const at = (iso: string) => boardClock(new Date(iso), ws.timezone).slice(11)
  setHeader(event, 'content-type', 'text/csv; charset=utf-8')
  setHeader(event, 'content-disposition', `attachment; filename="day-sheet-${day}.csv"`)
  const csv = stringify({ header: true, columns: ['section', 'bench', 'mould', 'casts', 'job', 'item', 'caster', 'mix', 'demould_open', 'demould_close', 'grade', 'consistency', 'plaster_kg', 'water_kg', 'bags', 'lot_to_open'] })
  for (const b of sheet.benches) {
    for (const p of b.pours) {
      csv.write({ section: 'pour', bench: b.benchName ?? '', mould: p.mouldCode, casts: p.casts, job: p.jobCode ?? '', item: p.itemDescription ?? '',
        caster: p.casterName ?? '', mix: at(p.mixAt), demould_open: at(p.demouldOpenAt), demould_close: at(p.demouldCloseAt),
        grade: p.gradeName, consistency: p.consistency, plaster_kg: p.plasterKg.toFixed(2), water_kg: p.waterKg.toFixed(2) })
    }
  }
  for (const r of sheet.requisition) {
    csv.write({ section: 'requisition', grade: r.gradeName, plaster_kg: r.plasterKg.toFixed(2), water_kg: r.waterLitres.toFixed(2), bags: r.bags, lot_to_open: r.lotToOpen?.lotCode ?? '' })
  }
  csv.end()
  return sendStream(event, csv)
})
