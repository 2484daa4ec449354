// What the pour board draws inside FullCalendar's cells, built as plain DOM nodes and handed to
// the calendar's content hooks (`{ domNodes }`). Not Vue slots: the Vue wrapper renders every
// slot's content as a teleport of its own root component, so a week of 750 bars was 750
// teleports re-rendered together on every change (first bar at 4x CPU: 10.6 s); plain nodes are
// drawn by the calendar itself, and a bar that changes is the only one built again.
//
// A pour is drawn as the plaster's cycle: mould prep, mixing, setting and clean-out as segments
// of the bar, the demould window as a band between brackets, and the phase in progress outlined
// while it runs (markPhases moves it on with the clock). The job code leads so a narrow week bar
// still reads: on one line, in the week and fortnight (`compact`) without its letter prefix
// ("J-2601" → "2601"), cut with an ellipsis if even that does not fit; the full code stays in
// the bar's title. The state shows as a word and by edge and fill (board.css), so it prints in
// black and white. Opening the pour is FullCalendar's eventClick; the bar itself is not a
// control. The lanes are hidden from assistive technology (FullCalendar's aria-hidden table):
// the list of pours beside the board is what a screen reader and the keyboard use, so a bar
// carries no text for them (every node counts: the calendar measures its lanes several times
// as it mounts, and each measure lays out every bar).
import type { PourDto, ProposedPourView } from '#shared/types/board'
import { PHASE_WORDS, phaseAt, pourPhases, pourStateWord } from '#shared/utils/board-phases'

type Clock = (iso: string) => string

/** An element with its classes, attributes and children (text or nodes). */
function el(tag: string, cls: string, attrs: Record<string, string> = {}, ...children: (Node | string)[]) {
  const e = document.createElement(tag)
  if (cls) e.className = cls
  for (const [k, v] of Object.entries(attrs)) e.setAttribute(k, v)
  e.append(...children)
  return e
}

export interface PourBarInput {
  pour: PourDto
  /** 'HH:mm' of an instant in the workshop's zone and clock */
  clock: Clock
  now: number
  compact: boolean
  depositWaiting: boolean
  /** casts per pour of the mould: a gang mould's bar reads "× N" */
  cavities: number
}

/** The code a bar leads with: in the week and fortnight without its letter prefix. */
export function barCode(jobCode: string | null, compact: boolean) {
  const full = jobCode ?? '—'
  return compact ? full.replace(/^[A-Za-z]+-(?=\w)/, '') : full
}

/** What the bar's title says: job, item, casts, state, the cycle's times, now, warnings, gate. */
export function pourBarLabel(b: PourBarInput): string {
  const p = b.pour
  const casts = Math.max(1, b.cavities)
  const current = p.state === 'void' ? null : phaseAt(p, b.now)
  return `${p.jobCode ?? 'No job'} · ${p.itemDescription ?? p.mouldCode}${casts > 1 ? ` · ${casts} casts` : ''} · ${pourStateWord(p)}`
    + ` · prep ${b.clock(p.slotStart)}, mix ${b.clock(p.mixAt)}, demould ${b.clock(p.demouldOpenAt)}–${b.clock(p.demouldCloseAt)}, clean until ${b.clock(p.slotEnd)}`
    + (current ? ` · now ${PHASE_WORDS[current]}` : '')
    + (p.warnings.length ? ` · ${p.warnings.length} warning${p.warnings.length > 1 ? 's' : ''}` : '')
    + (b.depositWaiting ? ' · waits for deposit: not to be started' : '')
}

/** One pour's bar. */
export function pourBarElement(b: PourBarInput): HTMLElement {
  const p = b.pour
  const casts = Math.max(1, b.cavities)
  const drawn = pourPhases(p)
  const bar = el('div', 'pour-bar', { 'title': pourBarLabel(b), 'data-testid': 'pour-bar', 'data-pour-id': String(p.id) })
  for (const s of drawn.phases) {
    const seg = el('span', `pour-phase phase-${s.phase}`, { 'data-phase-of': s.phase })
    seg.style.left = `${s.leftPct}%`
    seg.style.width = `${s.widthPct}%`
    bar.append(seg)
  }
  const demould = el('span', 'pour-window')
  demould.style.left = `${drawn.window.leftPct}%`
  demould.style.width = `${drawn.window.widthPct}%`
  const text = el('span', 'pour-text', { 'aria-hidden': 'true' }, el('strong', 'pour-code', { 'data-testid': 'pour-code' }, barCode(p.jobCode, b.compact)))
  if (casts > 1) text.append(el('span', 'pour-tag tabular', { 'data-testid': 'pour-cavities' }, `× ${casts}`))
  if (p.isSample) text.append(el('span', 'pour-tag', {}, 'sample'))
  if (b.depositWaiting) text.append(el('span', 'pour-tag', { 'data-testid': 'deposit-gate' }, '⏸ deposit'))
  text.append(el('span', 'pour-state', {}, pourStateWord(p)))
  if (p.warnings.length) text.append(el('span', 'pour-tag', {}, `⚠ ${p.warnings.length}`))
  bar.append(demould, text)
  markPhase(bar, b)
  return bar
}

/**
 * Marks the phase under way on a drawn bar (its segment raised, `data-phase` on the bar) and
 * brings its title up to date: run on every bar as the clock moves on.
 */
export function markPhase(bar: HTMLElement, b: PourBarInput) {
  const current = b.pour.state === 'void' ? null : phaseAt(b.pour, b.now)
  if (current) bar.dataset.phase = current
  else delete bar.dataset.phase
  for (const seg of bar.querySelectorAll<HTMLElement>('[data-phase-of]')) seg.classList.toggle('phase-now', seg.dataset.phaseOf === current)
  const label = pourBarLabel(b)
  if (bar.title !== label) bar.title = label
}

/** A pour the planner proposes: a ghost bar (dotted edge, the word "proposed") until the lead accepts the plan. */
export function proposalBarElement(p: ProposedPourView, clock: Clock): HTMLElement {
  return el('div', 'pour-bar', { title: `${p.jobCode} proposed, demould ${clock(p.demouldOpenAt)}` },
    el('span', 'pour-text', {}, el('strong', '', {}, p.jobCode), ' ', el('span', 'pour-state', {}, 'proposed')))
}

/** A bench band's label: the bench's name and how many moulds it holds. */
export function benchLabelNodes(bench: string, moulds: number): Node[] {
  return [el('span', 'bench-name', {}, bench), el('span', 'bench-count tabular', {}, `${moulds} moulds`)]
}

/** A mould's row label: its code, a flag when it is not ready or near the end of its life, and what it casts. */
export function mouldLabelNodes(m: { code: string; casts: string; stateFlag: string | null; lifeFlag: boolean }): Node[] {
  const out: Node[] = [el('span', 'font-semibold', {}, m.code)]
  if (m.stateFlag) out.push(el('span', 'mould-flag', {}, m.stateFlag))
  if (m.lifeFlag) out.push(el('span', 'mould-flag mould-flag-life', { title: 'At 90 % of its expected life' }, 'Near end of life'))
  out.push(el('span', 'block text-xs text-plaster-muted truncate', {}, m.casts))
  return out
}

/** A ruler label: its text, the shift's start or end, and the breaks that fall in it (left and width in % of the label). */
export function rulerLabelNodes(text: string, mark: 'start' | 'end' | null, breaks: { text: string; left: number; width: number }[]): Node[] {
  const out: Node[] = [el('span', 'ruler-text', {}, text)]
  if (mark) out.push(el('span', 'ruler-tag', {}, `shift ${mark}`))
  for (const b of breaks) {
    const band = el('span', 'ruler-break', { 'data-testid': 'ruler-break', 'title': `Break ${b.text}` }, el('span', 'ruler-break-word', {}, 'break'))
    band.style.left = `${b.left}%`
    band.style.width = `${b.width}%`
    out.push(band)
  }
  return out
}

/**
 * Nodes built once per key and handed out again while the key stays the same. FullCalendar
 * renders a cell again each time it re-measures its lanes as it mounts, and leaves the DOM as
 * it is only when it is given the very same nodes: new nodes on every pass were put in and laid
 * out again on every pass (mobile Lighthouse, demo board: TBT 1,060 ms without this cache,
 * 899 with it; 862 when the cells were Vue slots).
 * A node lives in one place: what the calendar draws twice at once (a dragged bar's mirror)
 * is built afresh instead.
 */
export class NodeCache {
  private nodes = new Map<string, Node[]>()
  get(key: string, build: () => Node[]): Node[] {
    let n = this.nodes.get(key)
    if (!n) this.nodes.set(key, n = build())
    return n
  }

  clear() {
    this.nodes.clear()
  }
}
