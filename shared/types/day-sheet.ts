// GET /api/day-sheet: the paper a caster pins at the bench.
import type { RequisitionLine } from '#shared/utils/board-rules'
import type { UnitSystem } from '../utils/units-display'

export interface DaySheetPour {
  id: number
  mouldCode: string
  casts: string
  jobCode: string | null
  itemDescription: string | null
  casterName: string | null
  mixAt: string
  demouldOpenAt: string
  demouldCloseAt: string
  gradeName: string
  consistency: number
  plasterKg: number
  waterKg: number
}

export interface DaySheetRequisition extends RequisitionLine {
  lotToOpen: { lotId: number; lotCode: string; useBy: string | null; stockKg: number } | null
}

export interface DaySheetDto {
  /** the sheet's calendar day, 'yyyy-MM-dd' (the workshop's today when none was asked for) */
  day: string
  timezone: string
  workshopName: string
  units: UnitSystem
  /** the day's shop temperature as set on the board, or the workshop's usual one (`usual`) */
  shopTemp: { tempC: number; usual: boolean }
  benches: { benchId: number | null; benchName: string | null; pours: DaySheetPour[] }[]
  requisition: DaySheetRequisition[]
}
