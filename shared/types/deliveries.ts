// What the crate, delivery and feed routes answer (server/services/deliveries.ts, feeds.ts).
import type { FinishingPieceState } from '#shared/utils/finishing-steps'

/** A piece as a crate or a delivery lists it: its handling weight and whether it needs two people. */
export interface CratePieceDto {
  id: number
  mark: string
  item: string | null
  state: FinishingPieceState
  kg: number
  teamLift: boolean
}

export interface CrateDto {
  id: number
  crateNo: number
  label: string
  deliveryId: number | null
  pieces: CratePieceDto[]
  totalKg: number
  /** over the workshop's heaviest crate: a warning, not a refusal (the lead may have a crane on site) */
  overWeight: boolean
}

export interface JobCratesDto {
  job: { id: number; code: string; title: string }
  crateMaxKg: number
  teamLiftKg: number
  crates: CrateDto[]
  /** ready or packed pieces of the job in no crate and on no delivery */
  loose: CratePieceDto[]
}

/** A crate's label as printed: the job, its client and site, the contents and the total. */
export interface CrateLabelDto {
  workshop: string
  job: { id: number; code: string; title: string; client: string | null; site: string | null }
  crate: CrateDto
  crateMaxKg: number
  teamLiftKg: number
}

export interface DeliveryPieceDto extends CratePieceDto {
  crateNo: number | null
  broken: boolean
  brokenNote: string | null
}

export interface DeliveryDto {
  id: number
  job: { id: number; code: string; title: string }
  site: { name: string; address: string; postcode: string | null; lifting: string | null } | null
  deliveryDay: string
  fixingOn: string | null
  vehicle: string
  state: 'booked' | 'delivered'
  crates: number
  pieces: DeliveryPieceDto[]
  totalKg: number
  deliveredAt: string | null
  receiverName: string | null
  photoId: string | null
  /** a crate or loose piece over the team-lift weight is on board */
  teamLiftKg: number
  version: number
}

/** What a client sees of a delivery: no staff names, no photo id, the counts and the state. */
export interface ClientDeliveryDto {
  id: number
  deliveryDay: string
  fixingOn: string | null
  vehicle: string
  state: 'booked' | 'delivered'
  site: string | null
  pieces: number
  broken: number
  totalKg: number
  deliveredAt: string | null
  receiverName: string | null
}

export interface DeliveryBookedDto {
  id: number
  pieces: number
  totalKg: number
  /** crates over the workshop's heaviest crate, by label */
  overWeight: string[]
  mailed: number
}

export interface DeliveryProofDto {
  id: number
  delivered: number
  broken: string[]
  noteNo: string
}

export interface CalendarFeedDto {
  id: number
  job: { id: number; code: string } | null
  createdAt: string
  revokedAt: string | null
}

/** A new feed: its address is shown once (only its hash is kept). */
export interface CalendarFeedCreatedDto extends CalendarFeedDto {
  url: string
}
