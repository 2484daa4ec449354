// The planner's public types (shared/utils/planner.ts): its input, what it proposes and why
// it left pieces out. Kept apart from the planner so its input checks (planner-input.ts) need
// only these, not the planner. Ids are strings (PostgreSQL bigints arrive as strings).
import type { PlasterGrade } from '../utils/plaster-core'
import type { WorkshopShiftCalendar } from '../utils/workshop-calendar'

/** Mould states as in `moulds.state`. */
export type PlannerMouldState = 'ready' | 'in_use' | 'cleaning' | 'repair' | 'retired'

/** A mould as the planner sees it; minutes for durations; expectedPulls null = no known life. */
export interface PlannerMould {
  id: string
  code: string
  benchId: string | null
  state: PlannerMouldState
  prepMinutes: number
  cleanMinutes: number
  maxDwellMinutes: number
  pulls: number
  expectedPulls: number | null
  /** the profile it casts: an item of that profile may use it (moulds of a profile are identical) */
  profileId?: string | null
  /**
   * Mould work (being made, or away for repair): no pour starts before this instant. A mould in
   * repair with a return date is planned from it; one in repair without is not planned.
   */
  availableFrom?: Date | null
  /** pieces one pour makes (a multi-cavity mould); default 1 */
  cavities?: number
}

/** A non-void pour already on the board. mixAt lets a caster's existing mixes block them. */
export interface PlannerExistingPour {
  mouldId: string
  slotStart: Date
  slotEnd: Date
  casterId?: string | null
  mixAt?: Date | null
}

/**
 * An open job item. `mouldIds`: the item's mould (job_items.mould_id); `alternativeMouldIds`:
 * other moulds that cast the same profile; then the moulds of `profileId`. Together, in that
 * order, they are the candidates (the order breaks ties). dueOn is the job's local due date 'YYYY-MM-DD' or null.
 */
export interface PlannerItem {
  itemId: string
  jobId: string
  jobCode: string
  dueOn: string | null
  sampleReleased: boolean
  /** false while the job waits for its deposit: its moulds are not started (left out: no deposit asked) */
  depositReleased?: boolean
  piecesRemaining: number
  mouldIds: string[]
  alternativeMouldIds?: string[]
  /**
   * The item's profile: every mould of it is a candidate too, after the named ones, as is every
   * mould sharing the profile of a named mould. An item naming only a profile is so planned.
   */
  profileId?: string | null
  grade: PlasterGrade
  consistency: number
  /** overrides options.setFactor for this item (e.g. a retarder in its mix) */
  setFactor?: number
  /**
   * Hours from a cast's demould until it is ready to dispatch: fettling and drying in the
   * drying room (default 0: the demould itself); null when the room would never dry it.
   */
  readyHours?: number | null
  /**
   * The first hours of readyHours that are people's work (fettling), counted in the shop's
   * shift time (working days and hours less breaks and closures) rather than round the clock;
   * the rest (drying) runs round the clock. Default 0.
   */
  fettleShiftHours?: number
}

/** A span of local days, both ends included ('YYYY-MM-DD'): a shop closure or an absence. */
export interface PlannerDaySpan {
  fromDay: string
  toDay: string
}

/**
 * A caster's own week: working days (ISO 1 = Mon … 7 = Sun), hours as local 'HH:MM', and
 * absences; a field left out is the workshop's. maxMixes: mixes they gauge at once (default 1).
 */
export interface PlannerCasterCalendar {
  workingDays?: number[]
  shiftStart?: string
  shiftEnd?: string
  absences?: PlannerDaySpan[]
  maxMixes?: number
}

/** Options; setFactor default 1, startAt default `from`, pourMinutes default POUR_MIX_MINUTES_DEFAULT. */
export interface PlanPoursOptions {
  setFactor?: number
  startAt?: Date
  pourMinutes?: number
  /** caster ids; when given, each pour gets a caster free and at work for its whole gauging */
  casters?: string[]
  /** per caster id: their days, hours, absences and mixes at once (default: the workshop's shift, one mix) */
  casterCalendars?: Record<string, PlannerCasterCalendar>
  /** per bench id: how many mixes may be gauged on it at once (a bench not listed: no limit) */
  benchMaxMixes?: Record<string, number>
  projectionDays?: number
}

/**
 * Input of planPours. shopTempByDay: °C per local date; days missing use defaultShopTempC
 * (default 20 °C, the plaster model's reference). The slurry is taken at the shop's
 * temperature (water and powder stored in the shop: common practice); a day below 0 °C gets
 * no pours (the gauging water would freeze), and a pour on a day from 0 to 5 °C carries a
 * cold-day caution. closures: days the shop is shut (holidays), no pour is planned on them.
 */
export interface PlanPoursInput {
  calendar: WorkshopShiftCalendar
  closures?: PlannerDaySpan[]
  from: Date
  to: Date
  moulds: PlannerMould[]
  existingPours: PlannerExistingPour[]
  items: PlannerItem[]
  shopTempByDay?: Record<string, number>
  defaultShopTempC?: number
  options?: PlanPoursOptions
}

/** One proposed pour. slotStart..slotEnd is the `slot` to book; day is its shift's local date. */
export interface ProposedPour {
  itemId: string
  jobId: string
  jobCode: string
  mouldId: string
  mouldCode: string
  benchId: string | null
  casterId: string | null
  day: string
  slotStart: Date
  mixAt: Date
  demouldOpenAt: Date
  demouldCloseAt: Date
  slotEnd: Date
  slurryTempC: number
  consistency: number
  setFactor: number
  /** the window opens after the shift; the mould holds the cast until the next shift starts */
  overnight: boolean
  /** pieces this pour counts toward its item (the mould's cavities, at most what was left) */
  pieces: number
  warnings: string[]
}

/**
 * Per job. readyAt: when its last piece is expected ready to dispatch (the last demould plus the
 * item's readyHours: fettling and drying), from the schedule continued past `to`; null when
 * some piece cannot be placed at all (e.g. a sample still awaiting approval) or would never dry.
 * projectedDate: readyAt's local date; finishesOn: the same when every piece is cast before
 * `to`. onTime: projectedDate ≤ dueOn (any date when dueOn is null); a job with nothing left to
 * cast is on time with no dates. waitsFor: the mould work its last piece waits for (the mould's code
 * and its available-from local day; the screen writes the day in the workshop's style);
 * note: why there is no date, in words.
 */
export interface PlannerJobOutcome {
  jobId: string
  jobCode: string
  dueOn: string | null
  piecesPlanned: number
  piecesRemaining: number
  finishesOn: string | null
  onTime: boolean
  projectedDate: string | null
  readyAt: Date | null
  waitsFor: { mouldCode: string; availableOn: string } | null
  note: string | null
}

/** Why pieces of an item could not be placed at all (not even in the projection). */
export type PlannerUnplacedReason = 'deposit-awaiting' | 'sample-awaiting-approval' | 'no-usable-mould' | 'mould-life-reached' | 'no-slot-in-horizon' | 'no-caster'

export interface PlannerUnplaced {
  itemId: string
  jobId: string
  reason: PlannerUnplacedReason
  pieces: number
  message: string
}

/** A mould an open item names but the planner would not (further) use. */
export interface PlannerMouldNote {
  mouldId: string
  code: string
  reason: 'repair' | 'retired' | 'expected-life'
  message: string
}

export interface PlanPoursResult {
  pours: ProposedPour[]
  jobs: PlannerJobOutcome[]
  unplaced: PlannerUnplaced[]
  moulds: PlannerMouldNote[]
}
