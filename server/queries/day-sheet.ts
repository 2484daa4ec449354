// The day sheet screen's read: the day's pours by bench and the plaster to fetch from the store.
import type { Knex } from 'knex'
import { daySheetRepo, poursRepo, type PourDtoRow } from '../repos/pours'
import { lotStockKg, lotToOpen, requisitionLine } from '#shared/utils/board-rules'
import { workshopsRepo } from '../repos/workshops'
import { shopDaysRepo } from '../repos/shop-days'
import { mouldsRepo } from '../repos/moulds'
import type { DaySheetConsumable, DaySheetDto, DaySheetPour, DaySheetRequisition } from '#shared/types/day-sheet'
import { consumablesRepo, mouldConsumablesRepo } from '../repos/consumables'
import { consumablesForPour } from '#shared/utils/plaster-fibrous'

function sheetPour(p: PourDtoRow, cavitiesOf: Map<number, number>): DaySheetPour {
  return {
    id: p.id, mouldCode: p.mould_code, casts: p.casts, jobCode: p.job_code, itemDescription: p.item_description, casterName: p.caster_name,
    mixAt: p.mix_at.toISOString(), demouldOpenAt: p.demould_open_at.toISOString(), demouldCloseAt: p.demould_close_at.toISOString(),
    gradeName: p.grade_name, consistency: Number(p.consistency), plasterKg: Number(p.plaster_kg_planned), waterKg: Number(p.water_kg_planned),
    cavities: cavitiesOf.get(Number(p.mould_id)) ?? 1,
  }
}

async function requisition(db: Knex, workshopId: number, day: string, pours: PourDtoRow[]): Promise<DaySheetRequisition[]> {
  const gradeIds = [...new Set(pours.map(p => p.grade_id))]
  if (!gradeIds.length) return []
  const [grades, lots] = await Promise.all([daySheetRepo.grades(db, workshopId, gradeIds), daySheetRepo.lots(db, workshopId, gradeIds)])
  return grades.sort((a, b) => a.name.localeCompare(b.name)).map((g) => {
    const line = requisitionLine({ gradeId: g.id, gradeName: g.name, bagKg: Number(g.bag_kg) },
      pours.filter(p => p.grade_id === g.id).map(p => ({ plasterKg: Number(p.plaster_kg_planned), waterKg: Number(p.water_kg_planned) })))
    const open = lotToOpen(lots.filter(l => l.grade_id === g.id).map(l => ({
      lotId: l.id, lotCode: l.lot_code, receivedOn: l.received_on, useBy: l.use_by,
      stockKg: lotStockKg({ bagsReceived: l.bags_received, bagKg: Number(l.bag_kg) }, Number(l.used_kg)),
    })), day)
    return { ...line, lotToOpen: open ? { lotId: open.lotId, lotCode: open.lotCode, useBy: open.useBy, stockKg: open.stockKg } : null }
  })
}

/** The consumables the day's pours use (their moulds' lists × cavities), summed, with the stock on hand. */
async function consumablesFor(db: Knex, workshopId: number, pours: PourDtoRow[], cavitiesOf: Map<number, number>): Promise<DaySheetConsumable[]> {
  const mouldIds = [...new Set(pours.map(p => Number(p.mould_id)))]
  if (!mouldIds.length) return []
  const lists = await mouldConsumablesRepo.list(db, workshopId, mouldIds)
  const sums = new Map<number, DaySheetConsumable>()
  for (const p of pours) {
    const list = lists.filter(l => Number(l.mould_id) === Number(p.mould_id))
      .map(l => ({ consumableId: Number(l.consumable_id), name: l.name, unit: l.unit, quantityPerCast: Number(l.quantity_per_cast) }))
    for (const u of consumablesForPour(list, { cavities: cavitiesOf.get(Number(p.mould_id)) ?? 1 })) {
      const id = Number(u.consumableId)
      const line = sums.get(id) ?? { consumableId: id, name: u.name, unit: u.unit, quantity: 0, onHand: 0 }
      line.quantity += u.quantity
      sums.set(id, line)
    }
  }
  const onHand = await consumablesRepo.onHand(db, workshopId, [...sums.keys()])
  return [...sums.values()].map(l => ({ ...l, onHand: onHand.get(l.consumableId) ?? 0 })).sort((a, b) => a.name.localeCompare(b.name))
}

/** The sheet of `day`, or of the workshop's own today (its zone, not UTC) when no day is asked for. */
export async function daySheet(workshopId: number, asked?: string): Promise<DaySheetDto> {
  const db = useDb()
  const day = asked ?? await workshopsRepo.today(db, workshopId)
  const [pours, benches, workshop, shopTempC] = await Promise.all([
    poursRepo.startingOn(db, workshopId, day), daySheetRepo.benches(db, workshopId), workshopsRepo.get(db, workshopId),
    shopDaysRepo.tempOn(db, workshopId, day),
  ])
  if (!workshop) notFound('Workshop')
  const cavitiesOf = await mouldsRepo.cavities(db, workshopId, [...new Set(pours.map(p => Number(p.mould_id)))])
  const sheet = (p: PourDtoRow) => sheetPour(p, cavitiesOf)
  const groups: DaySheetDto['benches'] = benches.map(b => ({ benchId: b.id, benchName: b.name, pours: pours.filter(p => p.bench_id === b.id).map(sheet) }))
  const loose = pours.filter(p => p.bench_id === null).map(sheet)
  if (loose.length) groups.push({ benchId: null, benchName: null, pours: loose })
  return {
    day, timezone: workshop.timezone, workshopName: workshop.name, units: workshop.units,
    shopTemp: shopTempC === null ? { tempC: Number(workshop.default_shop_temp_c), usual: true } : { tempC: shopTempC, usual: false },
    benches: groups.filter(g => g.pours.length), requisition: await requisition(db, workshopId, day, pours),
    consumables: await consumablesFor(db, workshopId, pours, cavitiesOf),
  }
}
