/**
 * One classification of where a pour stands against its clock, used by the caster's card, the
 * board (through PourDto.situation) and the lead's mail, so each screen names the same thing:
 *
 *   waiting         planned, the mix time not yet come
 *   mix_now         planned, mix time come, within MISSED_START_GRACE_MINUTES of it
 *   missed_start    planned (never mixed) and the mix time passed by more than the grace:
 *                   the cast was never made and needs re-planning, nothing is in the mould
 *   mixing          gauging started, the window not yet open
 *   setting         poured, the window not yet open
 *   ready           mixing or setting, the demould window open
 *   overdue_demould mixing or setting and the window closed: a cast is in the mould past its
 *                   dwell and can stick or crack (common practice)
 *   demoulded, void the pour is over
 *
 * A tablet offline works out the window from the steps it took (pourWindowFromSteps): the
 * server moves the window to the real start of mixing, so the card does the same meanwhile.
 * Pure: no I/O, no framework import.
 */
import { boardClock } from './board-rules'
import type { WorkshopLocale } from './workshop-format'

export type PourSituation = 'waiting' | 'mix_now' | 'missed_start' | 'mixing' | 'setting' | 'ready' | 'overdue_demould' | 'demoulded' | 'void'

/**
 * A start is missed a quarter hour after the planned mix time (our rule: about three mixes'
 * gauging time, beyond which the plan's window no longer holds and the lead should re-plan).
 */
export const MISSED_START_GRACE_MINUTES = 15

/** The words every screen uses for a situation. */
export const POUR_SITUATION_WORDS: Record<PourSituation, string> = {
  waiting: 'planned',
  mix_now: 'mix now',
  missed_start: 'missed start',
  mixing: 'mixing',
  setting: 'setting',
  ready: 'ready to demould',
  overdue_demould: 'overdue demould',
  demoulded: 'demoulded',
  void: 'void',
}

export interface PourClock {
  state: 'planned' | 'mixing' | 'setting' | 'demoulded' | 'void'
  mixAt: Date | string
  demouldOpenAt: Date | string
  demouldCloseAt: Date | string
}

const ms = (d: Date | string) => (typeof d === 'string' ? Date.parse(d) : d.getTime())

/** Where a pour stands at `now` (ms since the epoch or a Date). */
export function pourSituation(p: PourClock, now: number | Date): PourSituation {
  const t = typeof now === 'number' ? now : now.getTime()
  if (p.state === 'demoulded' || p.state === 'void') return p.state
  if (p.state === 'planned') {
    const mix = ms(p.mixAt)
    if (t < mix) return 'waiting'
    return t <= mix + MISSED_START_GRACE_MINUTES * 60_000 ? 'mix_now' : 'missed_start'
  }
  if (t > ms(p.demouldCloseAt)) return 'overdue_demould'
  if (t >= ms(p.demouldOpenAt)) return 'ready'
  return p.state
}

/** Whether a demould at `at` is early (before the window opens) or late (after it closed). */
export function demouldTiming(p: { demouldOpenAt: Date | string; demouldCloseAt: Date | string }, at: number | Date): 'early' | 'in_window' | 'late' {
  const t = typeof at === 'number' ? at : at.getTime()
  if (t < ms(p.demouldOpenAt)) return 'early'
  return t > ms(p.demouldCloseAt) ? 'late' : 'in_window'
}

/** A step a tablet has taken on a pour, answered by the server or not. */
export interface PourStepTaken { kind: string; at: string }

/**
 * The window a card shows given the steps taken on the device: once mixing started at a time
 * the server has not seen yet, the planned window moves by (start − planned mix time), as the
 * server will move it (it restarts the clock at the real start of mixing). Steps the server has
 * answered are already in the pour; only unanswered ones move it. ISO strings in and out.
 */
export function pourWindowFromSteps<P extends { state: string; mixAt: string; demouldOpenAt: string; demouldCloseAt: string }>(pour: P, steps: PourStepTaken[]): P {
  const start = steps.find(s => s.kind === 'start_mixing')
  if (!start || pour.state !== 'planned') return pour
  const shift = Date.parse(start.at) - Date.parse(pour.mixAt)
  if (!Number.isFinite(shift)) return pour
  const move = (iso: string) => new Date(Date.parse(iso) + shift).toISOString()
  return { ...pour, mixAt: start.at, demouldOpenAt: move(pour.demouldOpenAt), demouldCloseAt: move(pour.demouldCloseAt) }
}

/** The line a missed start leads the pour's warnings with (the board lists warnings). */
export function missedStartWarning(mixAt: Date | string, timezone: string, locale?: WorkshopLocale) {
  return `Missed start: never mixed; the mix was due at ${boardClock(new Date(ms(mixAt)), timezone, locale)}. Re-plan or void it.`
}
