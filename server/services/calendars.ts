// The shop's closures and the casters' weeks (lead): read for the calendar page and the planner,
// each list replaced whole in one transaction.
import type { Knex } from 'knex'
import type { Actor } from '../utils/auth'
import { calendarsRepo, type DaySpanRow } from '../repos/calendars'
import { usersRepo } from '../repos/users'
import type { CasterHoursInput, DaySpanInput } from '#shared/utils/calendar-schemas'
import type { CasterWeek, DaySpan, ShopCalendar } from '#shared/types/calendar'
import type { PlannerCasterCalendar } from '#shared/types/planner'

const span = (r: DaySpanRow): DaySpan => ({ fromDay: r.from_day, toDay: r.to_day, reason: r.reason })

async function casterWeeks(db: Knex, workshopId: number, fromDay: string | null): Promise<CasterWeek[]> {
  const [casters, absences] = await Promise.all([calendarsRepo.casters(db, workshopId), calendarsRepo.absences(db, workshopId, fromDay)])
  return casters.map(c => ({
    userId: c.id, name: c.name, workingDays: c.caster_days, shiftStart: c.caster_start, shiftEnd: c.caster_end, maxMixes: c.max_mixes,
    absences: absences.filter(a => Number(a.user_id) === Number(c.id)).map(span),
  }))
}

export async function shopCalendar(workshopId: number): Promise<ShopCalendar> {
  const db = useDb()
  const [closures, casters] = await Promise.all([calendarsRepo.closures(db, workshopId), casterWeeks(db, workshopId, null)])
  return { closures: closures.map(span), casters }
}

export async function replaceClosures(actor: Actor, closures: DaySpanInput[]): Promise<ShopCalendar> {
  await useDb().transaction(trx => calendarsRepo.replaceClosures(trx, actor.workshopId, closures))
  return shopCalendar(actor.workshopId)
}

/** A caster's days, hours, mixes at once and absences; another workshop's user is a 404, a non-caster a 422. */
export async function setCasterWeek(actor: Actor, userId: number, input: CasterHoursInput): Promise<CasterWeek> {
  const db = useDb()
  await db.transaction(async (trx) => {
    const user = await usersRepo.byId(trx, actor.workshopId, userId)
    if (!user) notFound('User')
    if (user.role !== 'caster') unprocessable([{ field: 'workingDays', message: `${user.name} is not a caster: only casters have casting hours` }])
    await usersRepo.setCasterHours(trx, actor.workshopId, userId, input)
    await calendarsRepo.replaceAbsences(trx, actor.workshopId, userId, input.absences)
  })
  return (await casterWeeks(db, actor.workshopId, null)).find(c => c.userId === userId)!
}

/** The planner's view: closures and each caster's calendar from `fromDay` on. */
export async function plannerCalendars(db: Knex, workshopId: number, fromDay: string) {
  const [closures, casters] = await Promise.all([calendarsRepo.closures(db, workshopId, fromDay), casterWeeks(db, workshopId, fromDay)])
  const casterCalendars: Record<string, PlannerCasterCalendar> = {}
  for (const c of casters) {
    casterCalendars[String(c.userId)] = {
      ...(c.workingDays ? { workingDays: c.workingDays } : {}),
      ...(c.shiftStart ? { shiftStart: c.shiftStart } : {}),
      ...(c.shiftEnd ? { shiftEnd: c.shiftEnd } : {}),
      absences: c.absences.map(a => ({ fromDay: a.fromDay, toDay: a.toDay })),
      maxMixes: c.maxMixes,
    }
  }
  return { closures: closures.map(c => ({ fromDay: c.from_day, toDay: c.to_day })), casterCalendars }
}
