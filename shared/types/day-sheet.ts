// GET /api/day-sheet: the paper a caster pins at the bench.
import type { RequisitionLine } from '#shared/utils/board-rules'
import type { UnitSystem } from '../utils/units-display'
import type { ConsumableUnit } from '../utils/plaster-fibrous'

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
  /** pieces the pour makes (its mould's cavities): the weights cover them all */
  cavities: number
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
  /** the day's consumables (scrim, laths, …) beside the plaster: per cast × cavities of each pour, and what is on hand */
  consumables: DaySheetConsumable[]
}

export interface DaySheetConsumable {
  consumableId: number
  name: string
  /** m2, m or each (the stored unit; shown in the workshop's) */
  unit: ConsumableUnit
  quantity: number
  onHand: number
}
