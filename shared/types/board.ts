// The board's data as GET /api/board returns it (the contract shared by the board page and
// the pours routes). Instants are ISO strings, days 'YYYY-MM-DD'.
import type { PourSituation } from '../utils/pour-status'
import type { WorkshopLocale } from '../utils/workshop-format'
/** The board's views: the shift day, and the working days of one or two weeks in shift hours. */
export type BoardView = 'day' | 'week' | 'fortnight'

export type PourState = 'planned' | 'mixing' | 'setting' | 'demoulded' | 'void'

export interface PourDto {
  id: number
  version: number
  mouldId: number
  mouldCode: string
  jobItemId: number | null
  jobId: number | null
  jobCode: string | null
  itemDescription: string | null
  casterId: number | null
  casterName: string | null
  gradeId: number
  gradeName: string
  lotId: number | null
  state: PourState
  isSample: boolean
  consistency: number
  setFactor: number
  slotStart: string
  slotEnd: string
  mixAt: string
  demouldOpenAt: string
  demouldCloseAt: string
  plasterKg: number
  waterKg: number
  /** the stored warnings, led by a missed start when the pour was never mixed in time */
  warnings: string[]
  /** a cast in the mould past its window (an overdue demould; never a missed start) */
  overdue: boolean
  /** where the pour stands against its clock (shared/utils/pour-status.ts), the same word on every screen */
  situation: PourSituation
}

export interface BoardMould {
  id: number
  code: string
  casts: string
  benchId: number | null
  benchName: string | null
  state: string
  pulls: number
  expectedPulls: number | null
  lifeFlag: boolean
  /** casts one pour fills (a gang mould has several): its bars read "× N" */
  cavities: number
}

/**
 * A pour on the board's wire form: one array of values in this order (no key repeated 1,500
 * times), ids only (names come once each from BoardData.lookups and the moulds and casters
 * lists) and its five instants as epoch milliseconds. shared/utils/board-lean.ts reads it
 * (leanPour names its fields; expandPour makes the PourDto every board component reads).
 */
export type BoardPourRow = [
  id: number, version: number, mouldId: number, jobItemId: number | null, casterId: number | null, gradeId: number, lotId: number | null,
  state: PourState, isSample: boolean, consistency: number, setFactor: number,
  slotStart: number, slotEnd: number, mixAt: number, demouldOpenAt: number, demouldCloseAt: number,
  plasterKg: number, waterKg: number, warnings: string[],
]

/** A board pour's fields by name (shared/utils/board-lean.ts leanPour), instants in `t` as epoch ms: [slotStart, slotEnd, mixAt, demouldOpenAt, demouldCloseAt]. */
export interface BoardPourFields {
  id: number
  version: number
  mouldId: number
  jobItemId: number | null
  casterId: number | null
  gradeId: number
  lotId: number | null
  state: PourState
  isSample: boolean
  consistency: number
  setFactor: number
  t: [number, number, number, number, number]
  plasterKg: number
  waterKg: number
  warnings: string[]
}

export interface BoardData {
  /** the server's clock when the board was read (ms): where each pour stands is judged against it */
  now: number
  workshop: { timezone: string; locale: WorkshopLocale; shiftStart: string; shiftEnd: string; shiftBreaks: { start: string; end: string }[]; workingDays: number[]; units: 'metric' | 'imperial'; defaultShopTempC: number; defaultHumidityPct: number }
  benches: { id: number; name: string; sortOrder: number }[]
  /** in the board's row order: bench, then code (shared/utils/board-axis.ts benchOrder) */
  moulds: BoardMould[]
  pours: BoardPourRow[]
  /** names the pours refer to, each sent once (keys are ids) */
  lookups: {
    jobs: Record<number, string>
    items: Record<number, { jobId: number; description: string }>
    grades: Record<number, string>
    /** the casters the pours name */
    people: Record<number, string>
    /** the applied calibration of the pours' grades that have one (factor, from how many pours) */
    calibration?: Record<number, { factor: number; count: number }>
  }
  shopDays: { day: string; tempC: number; humidityPct: number }[]
  jobItems: { id: number; jobId: number; jobCode: string; description: string; mouldId: number | null; piecesNeeded: number; piecesPlanned: number; released: boolean; depositWaiting?: boolean }[]
  /** active casters and leads: who a pour can be given to */
  casters: { id: number; name: string }[]
  /** open jobs still waiting for their deposit: their pours show the gate and are not started */
  depositWaitingJobs?: number[]
}

/** The board as its components read it: the pours expanded to PourDto. */
export type BoardScreen = Omit<BoardData, 'pours'> & { pours: PourDto[] }

/** A pour the planner proposes, shown on the board as a ghost bar until the lead accepts. */
export interface ProposedPourView {
  jobItemId: number
  mouldId: number
  slotStart: string
  slotEnd: string
  demouldOpenAt: string
  demouldCloseAt: string
  jobCode: string
  itemDescription?: string | null
}

/**
 * One line of the lead's Today: what needs the lead now, and where it is dealt with (`to`, a
 * path in the app). `kind` groups the lines; `text` is the sentence shown; `at` the day or
 * instant it concerns, when there is one.
 */
export type TodayLineKind = 'missed-start' | 'demould-overdue' | 'job-late' | 'lot' | 'mould' | 'finishing' | 'sample' | 'mail'

export interface TodayLine {
  kind: TodayLineKind
  text: string
  to: string
  at: string | null
}

/** GET /api/overview: the lead's Today. */
export interface TodayOverview {
  workshop: string
  timezone: string
  now: string
  lines: TodayLine[]
  poursTodayByState: Record<string, number>
}
