// The caller's workshop as the use cases need it: its row (404 when gone) and its shift
// calendar in the shape the pure planner and board rules take (workshop-calendar.ts).
import type { Knex } from 'knex'
import { workshopsRepo, type WorkshopRow } from '../repos/workshops'
import type { WorkshopShiftCalendar } from '#shared/utils/workshop-calendar'

export async function loadWorkshop(db: Knex, workshopId: number): Promise<WorkshopRow> {
  const ws = await workshopsRepo.get(db, workshopId)
  if (!ws) notFound('Workshop')
  return ws
}

export function workshopCalendar(ws: WorkshopRow): WorkshopShiftCalendar {
  return { timezone: ws.timezone, shiftStart: ws.shift_start, shiftEnd: ws.shift_end, workingDays: ws.working_days.map(Number), breaks: ws.shift_breaks }
}
