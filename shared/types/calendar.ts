// What the calendar routes send (camelCase on the wire): the shop's closures and each caster's week.

/** A span of local days, both ends included. */
export interface DaySpan {
  fromDay: string
  toDay: string
  reason: string | null
}

/** A caster's week: days and hours null follow the workshop's. */
export interface CasterWeek {
  userId: number
  name: string
  workingDays: number[] | null
  shiftStart: string | null
  shiftEnd: string | null
  maxMixes: number
  absences: DaySpan[]
}

/** GET /api/calendar: what the planner plans around. */
export interface ShopCalendar {
  closures: DaySpan[]
  casters: CasterWeek[]
}
