// GET /api/day-sheet: the day's pours by bench and the plaster requisition per grade.
import type { RequisitionLine } from '#shared/utils/board-rules'

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
  day: string
  timezone: string
  benches: { benchId: number | null; benchName: string | null; pours: DaySheetPour[] }[]
  requisition: DaySheetRequisition[]
}
