// The day sheet as CSV (lead, caster), through the shared sender (server/utils/csv.ts: formula
// escaping, BOM): one row per pour, then one per grade of the requisition, then one per
// consumable the day's pours use (scrim, laths…: for the day and on hand). Times in the
// workshop's zone on a 24-hour clock, as on the wall; weights and volumes in the workshop's
// units, each header naming its unit.
import { daySheet } from '../../queries/day-sheet'
import { CONSUMABLE_UNIT_LABELS, UNIT_LABELS, consumableToDisplay, displayNumber } from '#shared/utils/units-display'
import { formatTime } from '#shared/utils/workshop-format'

const text = (key: string, header = key) => ({ key, header })
const figure = (key: string, header = key) => ({ key, header, number: true })

export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead', 'caster')
  const { day } = validQuery(event, daySheetQuerySchema)
  const sheet = await daySheet(actor.workshopId, day)
  const u = sheet.units
  const { mass, volume } = UNIT_LABELS[u]
  const columns = [text('section'), text('bench'), text('mould'), figure('casts'), text('job'), text('item'), text('caster'), text('mix'),
    text('demould_open'), text('demould_close'), text('grade'), figure('consistency'), figure('plaster', `plaster_${mass}`),
    figure('water', `water_${mass}`), figure('water_volume', `water_${volume.replace(' ', '_')}`), figure('bags'), figure('bag', `bag_${mass}`), text('lot_to_open'),
    text('consumable'), figure('quantity'), figure('on_hand'), text('unit')]
  const at = (iso: string) => formatTime(iso, sheet.timezone)
  const rows: Record<string, unknown>[] = []
  for (const b of sheet.benches) {
    for (const p of b.pours) {
      rows.push({ section: 'pour', bench: b.benchName ?? '', mould: p.mouldCode, casts: p.casts, job: p.jobCode ?? '', item: p.itemDescription ?? '',
        caster: p.casterName ?? '', mix: at(p.mixAt), demould_open: at(p.demouldOpenAt), demould_close: at(p.demouldCloseAt),
        grade: p.gradeName, consistency: p.consistency, plaster: displayNumber('mass', p.plasterKg, u), water: displayNumber('mass', p.waterKg, u) })
    }
  }
  for (const r of sheet.requisition) {
    rows.push({ section: 'requisition', grade: r.gradeName, plaster: displayNumber('mass', r.plasterKg, u),
      water_volume: displayNumber('volume', r.waterLitres, u), bags: r.bags, bag: displayNumber('mass', r.bagKg, u, 1), lot_to_open: r.lotToOpen?.lotCode ?? '' })
  }
  // a consumable's unit is its own (m², m or each, in the workshop's units), so it has a column
  const amount = (x: number, unit: keyof typeof CONSUMABLE_UNIT_LABELS['metric']) => Number(consumableToDisplay(x, unit, u).toFixed(unit === 'each' ? 0 : 2))
  for (const c of sheet.consumables) {
    rows.push({ section: 'consumable', consumable: c.name, quantity: amount(c.quantity, c.unit), on_hand: amount(c.onHand, c.unit), unit: CONSUMABLE_UNIT_LABELS[u][c.unit] })
  }
  return sendCsvRows(event, `day-sheet-${sheet.day}.csv`, rows, columns)
})
