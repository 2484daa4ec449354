// The finisher's piece states and actions as the cards, the piece pages and the server know
// them: the states and their words, which state each action starts from and moves to, the
// timer steps, and the reasons a piece goes to repair. No zod here (finishing-schemas.ts holds
// the schemas; the action forms load it when they open).
import { CAST_DEFECTS } from './floor-steps'

export const FINISHING_PIECE_STATES = ['to_fettle', 'repair', 'drying', 'ready', 'packed', 'dispatched', 'rejected'] as const
export type FinishingPieceState = (typeof FINISHING_PIECE_STATES)[number]

/** The state words a finisher reads on a card. */
export const FINISHING_STATE_WORDS: Record<FinishingPieceState, string> = {
  to_fettle: 'To fettle', repair: 'In repair', drying: 'Drying', ready: 'Ready', packed: 'Packed', dispatched: 'Dispatched', rejected: 'Rejected',
}

/**
 * What is wrong with a cast when it goes to repair or is rejected: the same list the caster
 * picks from at demould (CAST_DEFECTS, floor-steps.ts). The form offers these and free text beside them.
 */
export const FINISHING_REASONS = CAST_DEFECTS

export const FINISHING_ACTION_KINDS = ['fettled', 'weighed', 'ready', 'repair', 'repaired', 'rejected', 'packed',
  'fettle_start', 'fettle_stop', 'repair_start', 'repair_stop'] as const
export type FinishingActionKind = (typeof FINISHING_ACTION_KINDS)[number]

/**
 * The states a piece may be in for each action, and the state it moves to. A weighing leaves a
 * drying piece drying (it still moves the piece's version on, like every action, so a tablet's
 * queued chain can name the versions it will meet). Dispatching is not here: it happens to
 * several pieces at once through a dispatch note.
 */
export const FINISHING_STEPS: Record<FinishingActionKind, { from: readonly FinishingPieceState[]; to: FinishingPieceState }> = {
  fettled: { from: ['to_fettle'], to: 'drying' },
  weighed: { from: ['drying'], to: 'drying' },
  ready: { from: ['drying'], to: 'ready' },
  repair: { from: ['to_fettle', 'drying'], to: 'repair' },
  repaired: { from: ['repair'], to: 'to_fettle' },
  rejected: { from: ['repair', 'to_fettle', 'drying'], to: 'rejected' },
  packed: { from: ['ready'], to: 'packed' },
  // the finisher's clock for the job's cost: started and stopped on the piece, state unchanged
  fettle_start: { from: ['to_fettle'], to: 'to_fettle' },
  fettle_stop: { from: ['to_fettle'], to: 'to_fettle' },
  repair_start: { from: ['repair'], to: 'repair' },
  repair_stop: { from: ['repair'], to: 'repair' },
}

/** The timer steps: which work they time, and whether they start or stop it. */
export const FINISHING_TIMER_STEPS = {
  fettle_start: { work: 'fettle', start: true },
  fettle_stop: { work: 'fettle', start: false },
  repair_start: { work: 'repair', start: true },
  repair_stop: { work: 'repair', start: false },
} as const
export type FinishingTimerKind = keyof typeof FINISHING_TIMER_STEPS
export type FinishingTimerWork = 'fettle' | 'repair'
