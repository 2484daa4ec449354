// Live events: a service emits one after its transaction commits, to the workshop's room
// (and, for what a client may see, to the job's room). Pages patch or refetch on them.
// One member per `type`, each with its own payload, so an emitter cannot send a row of the
// wrong shape and a listener knows what it gets.
import type { PourDto } from './board'
import type { FinishingPieceDto } from './finishing'

/** A shop day as saved, with how many planned pours of the day got a new demould time. */
export interface LiveShopDay { day: string; tempC: number; humidityPct: number; moved: number }

/** A piece the floor just made from a demoulded pour. */
export interface LivePieceCreated { id: number; mark: string; pourId: number }

/** Only what a client may see of a photo (the same event reaches the job's room). */
export interface LivePhoto { id: string; jobId: number; shared: boolean; caption: string | null }

/** The workshop's settings as GET /api/workshop returns them. */
export interface LiveWorkshop {
  name: string
  units: 'metric' | 'imperial'
  timezone: string
  shiftStart: string
  shiftEnd: string
  /** breaks in every working day's shift, local 'HH:MM' pairs (the set-up form may leave them out) */
  shiftBreaks?: { start: string; end: string }[]
  workingDays: number[]
  defaultShopTempC: number
  defaultHumidityPct: number
  /** how days and numbers are written (shared/utils/workshop-format.ts) */
  locale: 'en-GB' | 'en-US'
  /** the heaviest crate it packs, kg (over it a crate is flagged) */
  crateMaxKg: number
  version: number
}

export type LiveEvent
  = | { type: 'pour.created' | 'pour.updated' | 'pour.voided'; id: number; version: number; row: PourDto }
  /** many pours at once (the planner's accepted plan): read the board again */
    | { type: 'board.refreshed'; id: number }
    | { type: 'shopday.updated'; id: string; row: LiveShopDay }
    | { type: 'piece.created'; id: number; row: LivePieceCreated }
    | { type: 'piece.updated'; id: number; version: number; row: FinishingPieceDto }
  /** a job's client counts moved; nothing internal is sent */
    | { type: 'job.progress'; id: number }
    | { type: 'dispatch.created'; id: number; row: { id: number; noteNo: string; jobId: number; pieceIds: number[] } }
    | { type: 'photo.created' | 'photo.updated' | 'photo.deleted'; id: string; row: LivePhoto }
    | { type: 'workshop.updated'; id: number; version: number; row: LiveWorkshop }

export type LiveEventType = LiveEvent['type']

/** Not sent by the server: the page's own signal that the socket came back and it should read again. */
export interface LiveCatchUp { type: 'catch-up'; id: 0 }

/**
 * A page's first connection says when its data was read (`since`, the server's clock in ms: the
 * start of the request that rendered the document), and the server answers every connection
 * with `live-since`: whether an event went to the socket's rooms at or after that time, i.e.
 * one the page may have missed while its socket was not yet open.
 */
export interface LiveHandshake { since?: number }
export interface LiveSinceAnswer { missed: boolean }
/** The server's message name for LiveSinceAnswer. */
export const LIVE_SINCE = 'live-since'

export const liveRooms = {
  workshop: (id: number) => `workshop:${id}`,
  job: (id: number) => `job:${id}`,
  /** the socket of whoever is switched in on a shared tablet, so revoking the tablet can drop it */
  tablet: (id: number) => `tablet:${id}`,
  /** every socket of one person, so a change to their rights reaches all of them at once */
  user: (id: number) => `user:${id}`,
  /** the sockets opened with one session (user_sessions.id), so signing out drops them */
  session: (id: number) => `session:${id}`,
}
