// A pour's slot split into the plaster's cycle, for drawing it on the board. The instants come
// from the pour (shared/utils/pour-timing.ts defines them): the slot opens with mould prep,
// gauging starts at mixAt and lasts POUR_MIX_MINUTES_DEFAULT, the plaster sets until the demould
// window opens, the cast comes out as it opens and the mould is cleaned until the slot ends.
// The demould window (open..close) is a band of its own: it may run past the clean-out.
import { POUR_MIX_MINUTES_DEFAULT } from './pour-timing'

export type PourPhase = 'prep' | 'mixing' | 'setting' | 'clean'

export const PHASE_WORDS: Record<PourPhase, string> = { prep: 'mould prep', mixing: 'mixing', setting: 'setting', clean: 'clean-out' }

export interface PhaseSpan { phase: PourPhase; start: number; end: number; leftPct: number; widthPct: number }

export interface PourInstants { slotStart: string; slotEnd: string; mixAt: string; demouldOpenAt: string; demouldCloseAt: string }

/** The phases in order with their share of the bar (percent), and the demould band; empty phases are left out. */
export function pourPhases(p: PourInstants) {
  const start = Date.parse(p.slotStart)
  const end = Date.parse(p.slotEnd)
  const span = Math.max(end - start, 1)
  const mix = Date.parse(p.mixAt)
  const open = Date.parse(p.demouldOpenAt)
  const clip = (x: number) => Math.min(end, Math.max(start, x))
  const pct = (x: number) => ((clip(x) - start) / span) * 100
  const bounds: [PourPhase, number, number][] = [
    ['prep', start, mix],
    ['mixing', mix, Math.min(mix + POUR_MIX_MINUTES_DEFAULT * 60_000, open)],
    ['setting', Math.min(mix + POUR_MIX_MINUTES_DEFAULT * 60_000, open), open],
    ['clean', open, end],
  ]
  const phases: PhaseSpan[] = bounds
    .filter(([, a, b]) => clip(b) > clip(a))
    .map(([phase, a, b]) => ({ phase, start: clip(a), end: clip(b), leftPct: pct(a), widthPct: pct(b) - pct(a) }))
  const windowLeft = pct(open)
  const windowRight = pct(Date.parse(p.demouldCloseAt))
  return { phases, window: { leftPct: windowLeft, widthPct: Math.max(windowRight - windowLeft, 1.5) } }
}

/** The phase under way at `now`, or null before the slot and after it. */
export function phaseAt(p: PourInstants, now: number): PourPhase | null {
  return pourPhases(p).phases.find(s => now >= s.start && now < s.end)?.phase ?? null
}

/**
 * The one word a pour's state shows on the board, in its list and in print. Every board
 * surface asks here, so a shared classification of late pours can replace it in one place.
 */
export function pourStateWord(p: { state: string; overdue: boolean }): string {
  if (p.overdue) return 'overdue'
  return p.state
}
