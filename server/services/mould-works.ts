// Mould work (lead): a mould being made or repaired, its stages and the day it is available
// from. The planner reads the open works' dates (services/planning.ts).
import type { Actor } from '../utils/auth'
import { mouldsRepo } from '../repos/moulds'
import { usersRepo } from '../repos/users'
import { calendarsRepo } from '../repos/calendars'
import { mouldWorksRepo, type MouldWorkRow } from '../repos/mould-works'
import { loadWorkshop } from './workshop'
import { mouldWorkAvailableFrom } from '#shared/utils/mould-work'
import type { MouldWorkPutInput } from '#shared/utils/mould-work-schemas'
import type { MouldWork } from '#shared/types/mould-work'

const toDto = (r: MouldWorkRow): MouldWork => ({
  id: r.id, mouldId: r.mould_id, kind: r.kind, stages: r.stages, assignedTo: r.assigned_to, assignedName: r.assigned_name,
  startedOn: r.started_on, availableFrom: r.available_from, state: r.state, notes: r.notes, version: r.version,
})

export async function mouldWork(workshopId: number, mouldId: number): Promise<MouldWork | null> {
  const db = useDb()
  if (!(await mouldsRepo.byId(db, workshopId, mouldId))) notFound('Mould')
  const row = await mouldWorksRepo.forMould(db, workshopId, mouldId)
  return row ? toDto(row) : null
}

/** Puts the mould's open work; without a date given, it is available the working day after its stages end. */
export async function putMouldWork(actor: Actor, mouldId: number, input: MouldWorkPutInput): Promise<MouldWork> {
  const db = useDb()
  await db.transaction(async (trx) => {
    if (!(await mouldsRepo.byId(trx, actor.workshopId, mouldId))) notFound('Mould')
    if (input.assignedTo && !(await usersRepo.byId(trx, actor.workshopId, input.assignedTo))) {
      unprocessable([{ field: 'assignedTo', message: 'assignedTo is not a person of this workshop' }])
    }
    let availableFrom = input.availableFrom ?? null
    if (!availableFrom) {
      const ws = await loadWorkshop(trx, actor.workshopId)
      const closures = await calendarsRepo.closures(trx, actor.workshopId, input.startedOn)
      const closedDays = closures.flatMap((c) => {
        const days: string[] = []
        for (let d = c.from_day; d <= c.to_day && days.length < 400; d = new Date(Date.parse(`${d}T00:00:00Z`) + 86_400_000).toISOString().slice(0, 10)) days.push(d)
        return days
      })
      availableFrom = mouldWorkAvailableFrom({ startedOn: input.startedOn, stages: input.stages, workingDays: ws.working_days, closedDays })
    }
    await mouldWorksRepo.put(trx, actor.workshopId, mouldId, {
      kind: input.kind, stages: input.stages, assignedTo: input.assignedTo ?? null, startedOn: input.startedOn,
      availableFrom, state: input.state, notes: input.notes ?? null,
    })
  })
  return (await mouldWork(actor.workshopId, mouldId))!
}
