// What the finishing routes return: pieces as cards on the finisher's tablet, the queue, an
// action's answer, and dispatch notes.
import type { FinishingPieceState } from '../utils/finishing-steps'

export interface FinishingWeighingDto {
  kg: number
  at: string
  /** weighed less the computed dry mass, kg and % of the dry mass (plaster-drying.ts `dryness`): a guide, not the gate */
  freeWaterKg: number
  freeWaterPct: number
}

/** Whether the drying spell's weighings show constant weight (plaster-drying.ts `constantWeight`), and what is missing if not. */
export interface FinishingConstantWeightDto {
  isDry: boolean
  changePct: number | null
  hoursApart: number | null
  message: string
}

/** The computed dry mass as a range (plaster-drying.ts `dryMassGuide`): ±2 %, lower still when the batch was over plan. */
export interface FinishingDryMassGuideDto {
  lowKg: number
  highKg: number
  batchExcessPct: number
}

export interface FinishingPieceDto {
  id: number
  version: number
  mark: string
  state: FinishingPieceState
  job: { id: number; code: string; title: string; dueOn: string | null } | null
  item: { id: number; description: string } | null
  /** thicknessMm: the section the piece dries through (a fibrous shell's, plaster-fibrous.ts) */
  mould: { code: string; casts: string; cavityLitres: number; thicknessMm: number }
  dryMassKg: number
  wetMassKg: number
  /** the weight to lift it at (finishingHandlingKg) */
  handlingKg: number
  teamLift: boolean
  demouldedAt: string | null
  dryBy: string | null
  dryingTempC: number | null
  dryingHumidityPct: number | null
  reason: string | null
  /** the latest weighing since the piece last went to drying */
  lastWeighing: FinishingWeighingDto | null
  /** the current drying spell's weighings (last 20, oldest first) */
  weighings: { kg: number; at: string }[]
  /** the ready gate: two weighings at least a day apart within the tolerance */
  constantWeight: FinishingConstantWeightDto
  dryMassGuide: FinishingDryMassGuideDto
  dispatchId: number | null
  /** fettling or repair being timed on the finishing tablet now (for the job's cost), or null */
  timer: { work: 'fettle' | 'repair'; since: string; by: string | null } | null
}

/** The drying room's conditions the fettle form starts from: today's shop day, else the workshop's usual. */
export interface FinishingDryingRoom { tempC: number; humidityPct: number; source: 'shop day' | 'workshop' }

/** The falling-rate factor a dry-by date uses: the shop's own from its weighings, or the default (finishingFallingRate). */
export interface FinishingFallingRateDto { factor: number; count: number; source: 'shop' | 'default'; note: string }

export interface FinishingQueue {
  timezone: string
  /** the room, and the falling-rate factor the fettle form's dry-by preview uses (the server's own) */
  room: FinishingDryingRoom & { fallingRate: FinishingFallingRateDto }
  toFettle: FinishingPieceDto[]
  repair: FinishingPieceDto[]
  drying: FinishingPieceDto[]
  ready: FinishingPieceDto[]
  packed: FinishingPieceDto[]
}

export interface FinishingActionResult {
  piece: FinishingPieceDto
  /** the weighing's answer (weighed only): free water against the computed dry mass (a guide) and constant weight (the gate) */
  dryness: { freeWaterKg: number; freeWaterPct: number; warnings: string[]; constantWeight: FinishingConstantWeightDto } | null
  /** the drying estimate (fettled only); hours is null when the air is saturated; the falling-rate factor it used and where from */
  drying: { hours: number | null; dryBy: string | null; warnings: string[]; fallingRate: FinishingFallingRateDto } | null
  /** true when this action made the piece's job ready for dispatch (ready only) */
  jobReady: boolean
}

export interface DispatchSummaryDto {
  id: number
  noteNo: string
  dispatchedAt: string
  dispatchedBy: string | null
  pieces: number
  totalKg: number
}

export interface DispatchNotePieceDto {
  id: number
  mark: string
  item: string | null
  mould: string
  kg: number
  /** true when kg is a weighing, false when it is the computed dry mass */
  weighed: boolean
  teamLift: boolean
}

export interface DispatchNoteDto {
  id: number
  noteNo: string
  dispatchedAt: string
  dispatchedBy: string | null
  notes: string | null
  timezone: string
  workshop: string
  job: { id: number; code: string; title: string; site: string | null; client: string | null }
  pieces: DispatchNotePieceDto[]
  totalKg: number
  teamLiftKg: number
}

export interface JobDispatchesDto {
  timezone: string
  job: { id: number; code: string; title: string }
  notes: DispatchSummaryDto[]
  /** the job's packed pieces: what a new note can carry */
  packed: FinishingPieceDto[]
  /** how many of the job's pieces are ready but not yet packed */
  readyCount: number
}
