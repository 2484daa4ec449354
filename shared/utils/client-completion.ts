/**
 * The date a client is told their job will be ready to dispatch. Only when every piece
 * ordered is planned: until then the page says how many are not planned yet, because a date
 * from part of a job would be untrue. Once all are planned, the date is the latest of each
 * planned cast's ready time:
 *
 *   a piece already dry (ready, packed, dispatched)  no wait
 *   a piece put to dry with a dry-by                 its dry-by
 *   any other cast                                   demoulded (or the plan's demould opening)
 *                                                    + FETTLING_ALLOWANCE_HOURS of shift time
 *                                                      (addShiftHours: the workshop's working
 *                                                      days and hours, less breaks and closures,
 *                                                      when the calendar is given)
 *                                                    + drying hours (finishingDryBy: the drying
 *                                                      estimate of plaster-drying.ts, Carrier's
 *                                                      equation as in the ASHRAE Handbook, at the
 *                                                      workshop's usual temperature and humidity,
 *                                                      times the shop's own falling-rate factor
 *                                                      once it has weighed enough pieces to
 *                                                      constant weight: finishingFallingRate)
 *
 * Pure: the server gathers the facts.
 */
import { finishingDryBy } from './finishing'
import { batchForCavity, castFromBatch } from './plaster'
import type { PlasterGrade } from './plaster-core'
import { addShiftHours, type WorkshopShiftCalendar } from './workshop-calendar'

/**
 * Hours of shift time from demoulding until a cast is fettled and racked to dry: 2 (common
 * practice for cast ornament fettled the day it comes out; a repair takes longer, and the
 * weighing decides when it is dry in any case). People fettle, so these hours wait for the shift.
 */
export const FETTLING_ALLOWANCE_HOURS = 2

const HOUR_MS = 3_600_000

/**
 * The drying room a date is worked out for: its air, and the shop's falling-rate factor (from
 * its own weighings, shared/utils/finishing.ts finishingFallingRate; 1 until it has enough), the
 * same factor a piece put to dry gets for its dry-by.
 */
export interface DryingRoom { tempC: number; humidityPct: number; fallingRateFactor?: number }

/**
 * Hours from a cast's demould until it is ready to dispatch: FETTLING_ALLOWANCE_HOURS, then the
 * drying estimate (finishingDryBy) in the room's conditions; null when it would never dry.
 * The one rule behind the client's date (jobCompletion) and the planner's (services/planning.ts).
 */
export function castReadyHours(c: { wetMassKg: number; dryMassKg: number; cavityLitres: number; thicknessMm?: number }, room: DryingRoom): number | null {
  const dry = finishingDryBy({
    from: new Date(0), wetMassKg: c.wetMassKg, dryMassKg: c.dryMassKg, cavityLitres: c.cavityLitres, thicknessMm: c.thicknessMm,
    airTempC: room.tempC, relHumidityPct: room.humidityPct, fallingRateFactor: room.fallingRateFactor,
  })
  return Number.isFinite(dry.hours) ? FETTLING_ALLOWANCE_HOURS + dry.hours : null
}

/**
 * castReadyHours of a cast not made yet: its masses from the batch that fills one piece's
 * cavity or shell (no waste), drying through `thicknessMm` (a fibrous shell's; default solid).
 */
export function plannedCastReadyHours(input: { cavityLitres: number; consistency: number; grade: PlasterGrade; room: DryingRoom; thicknessMm?: number }): number | null {
  const batch = batchForCavity({ cavityLitres: input.cavityLitres, consistency: input.consistency, grade: input.grade })
  const cast = castFromBatch({ plasterKg: batch.plasterKg, waterKg: batch.waterKg, grade: input.grade })
  return castReadyHours({ wetMassKg: cast.wetMassKg, dryMassKg: cast.dryMassKg, cavityLitres: input.cavityLitres, thicknessMm: input.thicknessMm }, input.room)
}

export interface CompletionCast {
  /** the piece's state once demoulded, or null for a cast not yet out of the mould */
  pieceState: string | null
  dryBy: Date | null
  demouldedAt: Date | null
  demouldOpenAt: Date
  wetMassKg: number
  dryMassKg: number
  /** one piece's cavity (or fibrous shell), L */
  cavityLitres: number
  /** the section it dries through, mm (a fibrous shell's); the usual solid section when absent */
  thicknessMm?: number
}

export interface CompletionInput {
  /** per item: pieces ordered and pieces planned (non-void pours not rejected) */
  items: { piecesNeeded: number; planned: number }[]
  casts: CompletionCast[]
  room: DryingRoom
  /** the workshop's shift and its closures: fettling waits for people on shift (round the clock when left out) */
  calendar?: WorkshopShiftCalendar
  closures?: readonly { fromDay: string; toDay: string }[]
}

export type Completion
  = | { kind: 'ready_by'; at: Date }
    | { kind: 'not_planned'; notPlanned: number; ordered: number }
    | { kind: 'never_dries' }
    | { kind: 'all_ready' }

const DRY = ['ready', 'packed', 'dispatched']

/** When the last piece is expected ready to dispatch, or how many pieces are not planned yet. */
export function jobCompletion(input: CompletionInput): Completion {
  const ordered = input.items.reduce((s, i) => s + i.piecesNeeded, 0)
  const notPlanned = input.items.reduce((s, i) => s + Math.max(0, i.piecesNeeded - i.planned), 0)
  if (notPlanned > 0 || ordered === 0) return { kind: 'not_planned', notPlanned, ordered }
  let last = 0
  for (const c of input.casts) {
    if (c.pieceState && DRY.includes(c.pieceState)) continue
    if (c.dryBy) {
      last = Math.max(last, c.dryBy.getTime())
      continue
    }
    const hours = castReadyHours(c, input.room)
    if (hours === null) return { kind: 'never_dries' }
    const out = c.demouldedAt ?? c.demouldOpenAt
    const fettled = input.calendar ? addShiftHours(input.calendar, out, FETTLING_ALLOWANCE_HOURS, input.closures) : new Date(out.getTime() + FETTLING_ALLOWANCE_HOURS * HOUR_MS)
    last = Math.max(last, fettled.getTime() + (hours - FETTLING_ALLOWANCE_HOURS) * HOUR_MS)
  }
  return last ? { kind: 'ready_by', at: new Date(last) } : { kind: 'all_ready' }
}
