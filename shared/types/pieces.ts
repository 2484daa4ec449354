// What the piece page, the labels and a scan return.
import type { FinishingActionKind } from '../utils/finishing-steps'
import type { PieceRunPlace } from '../utils/piece-labels'
import type { FinishingPieceDto } from './finishing'

export interface PiecePourDto {
  id: number
  grade: string
  lot: string | null
  consistency: number
  caster: string | null
  isSample: boolean
  plannedMixAt: string
  mixingAt: string | null
  pouredAt: string | null
  demouldedAt: string | null
  backdated: boolean
  result: 'sound' | 'defect' | null
  defect: string | null
}

export interface PieceWeighingDto {
  kg: number
  at: string
  by: string | null
  freeWaterPct: number
  isDry: boolean
}

/** One register entry of the piece: made at demould, its finishing steps (fettled, repair, …), dispatched; when, by whom, and the reason or note given. */
export interface PieceHistoryDto {
  kind: FinishingActionKind | 'created' | 'dispatched' | 'other'
  at: string
  by: string | null
  /** a repair's or rejection's reason, a repair's notes */
  note: string | null
  /** a lead passed it as dry without a dry weighing */
  override: boolean
}

/** GET /api/pieces/:id: the piece's story for staff. */
export interface PieceStoryDto {
  timezone: string
  piece: FinishingPieceDto
  pour: PiecePourDto
  /** where a run piece goes; null for pieces of no run */
  place: PieceRunPlace | null
  weighings: PieceWeighingDto[]
  photos: { id: string; caption: string | null; createdAt: string }[]
  history: PieceHistoryDto[]
  nextSteps: FinishingActionKind[]
  dispatch: { id: number; noteNo: string; dispatchedAt: string } | null
  /** the live label, when one was printed */
  label: { createdAt: string } | null
}

/** One printable label (GET /api/pieces/:id/label, GET /api/labels). */
export interface PieceLabelDto {
  pieceId: number
  mark: string
  job: { code: string; title: string } | null
  item: string | null
  place: PieceRunPlace | null
  /** the weight to lift it at, kg (finishingHandlingKg) and whether that asks for two people */
  kg: number
  teamLift: boolean
  url: string
  /** the QR code of `url` as an SVG document, made on the server */
  qrSvg: string
}

/** GET /api/labels/:token: the piece a scanned label names and what can be done with it now. */
export interface LabelScanDto {
  piece: FinishingPieceDto
  nextSteps: FinishingActionKind[]
}

/** POST /api/pieces/:id/label/revoke */
export interface LabelRevokedDto {
  pieceId: number
  revoked: number
}
