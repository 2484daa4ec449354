// Shop conditions for a day: saving them re-times that day's planned pours, which keep
// their prep start (the lead placed them there) but get the set time of the new temperature.
import type { Actor } from '../utils/auth'
import { poursRepo } from '../repos/pours'
import { shopDaysRepo, shopDayDto } from '../repos/shop-days'
import type { PourDto } from '#shared/types/board'
import { pourDto, retimePourRow } from './pours'
import { loadWorkshop } from './workshop'

export async function setShopDay(actor: Actor, day: string, input: { tempC: number; humidityPct: number }) {
  const db = useDb()
  const ws = await loadWorkshop(db, actor.workshopId)
  const { saved, changed, moved } = await db.transaction(async (trx) => {
    const saved = await shopDaysRepo.upsert(trx, ws.id, actor.id, { day, ...input })
    const pours = await poursRepo.startingOn(trx, ws.id, day, ['planned'])
    const changed: number[] = []
    let moved = 0
    for (const p of pours) {
      const row = await poursRepo.forUpdate(trx, ws.id, p.id)
      if (row?.state !== 'planned') continue
      const write = await retimePourRow(trx, ws, {
        mouldId: row.mould_id, slotStart: row.slot_start, jobItemId: row.job_item_id, casterId: row.caster_id, gradeId: row.grade_id,
        consistency: Number(row.consistency), setFactor: Number(row.set_factor), lotId: row.lot_id, isSample: row.is_sample,
      }, p.id)
      await poursRepo.replan(trx, ws.id, p.id, row.version, write)
      await poursRepo.event(trx, { workshopId: ws.id, pourId: p.id, type: 'pour.retimed', actorId: actor.id, data: { day, ...input, demouldOpenAt: write.demould_open_at, warnings: write.warnings } })
      changed.push(p.id)
      if (write.demould_open_at.getTime() !== p.demould_open_at.getTime()) moved++
    }
    return { saved, changed, moved }
  })
  const rows: PourDto[] = []
  for (const id of changed) rows.push(pourDto((await poursRepo.dto(db, ws.id, id))!))
  for (const row of rows) emitToWorkshop(ws.id, { type: 'pour.updated', id: row.id, version: row.version, row })
  const dto = { ...shopDayDto(saved), moved }
  emitToWorkshop(ws.id, { type: 'shopday.updated', id: day, row: dto })
  return dto
}

/** The shop days entered for the local days from..to. */
export async function shopDaysBetween(workshopId: number, from: string, to: string) {
  return (await shopDaysRepo.between(useDb(), workshopId, from, to)).map(shopDayDto)
}
