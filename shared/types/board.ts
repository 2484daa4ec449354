// The board's data as GET /api/board returns it (the contract shared by the board page and
// the pours routes). Instants are ISO strings, days 'YYYY-MM-DD'.
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
  warnings: string[]
  overdue: boolean
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
}

export interface BoardData {
  workshop: { timezone: string; shiftStart: string; shiftEnd: string; workingDays: number[]; units: 'metric' | 'imperial'; defaultShopTempC: number }
  benches: { id: number; name: string; sortOrder: number }[]
  moulds: BoardMould[]
  pours: PourDto[]
  shopDays: { day: string; tempC: number; humidityPct: number }[]
  jobItems: { id: number; jobId: number; jobCode: string; description: string; mouldId: number | null; piecesNeeded: number; piecesPlanned: number; released: boolean }[]
  casters: { id: number; name: string }[]
}

/** A pour the planner proposes, shown on the board as a ghost bar until the lead accepts. */
export interface ProposedPourView {
  jobItemId: number
  mouldId: number
  slotStart: string
  slotEnd: string
  demouldOpenAt: string
  demouldCloseAt: string
  jobCode: string
  itemDescription?: string
}
