// One pour bar on the board as board-dom builds it (in a browser-like DOM): a gang mould's bar
// says how many casts the pour makes ("× 4", and "4 casts" in its title),
// a one-cavity mould's bar carries no count; the cycle's phases are segments of the bar, and the
// phase under way is marked and moves on with the clock. The pour is our own example (a
// 08:00–11:00 slot in London, mixing from 08:15, demould window 09:00–10:30).
import { describe, expect, it } from 'vitest'
import type { PourDto } from '#shared/types/board'
import { markPhase, NodeCache, pourBarElement, type PourBarInput } from '../../app/utils/board-dom'
import { formatTime } from '#shared/utils/workshop-format'

const pour: PourDto = {
  id: 7, version: 1, mouldId: 3, mouldCode: 'RS-12', jobItemId: 11, jobId: 2, jobCode: 'J-2602', itemDescription: 'Ceiling roses',
  casterId: null, casterName: null, gradeId: 1, gradeName: 'Casting plaster', lotId: null, state: 'planned', isSample: false,
  consistency: 70, setFactor: 1, slotStart: '2027-03-01T08:00:00.000Z', slotEnd: '2027-03-01T11:00:00.000Z',
  mixAt: '2027-03-01T08:15:00.000Z', demouldOpenAt: '2027-03-01T09:00:00.000Z', demouldCloseAt: '2027-03-01T10:30:00.000Z',
  plasterKg: 6.4, waterKg: 4.5, warnings: [], overdue: false, situation: 'waiting',
}
const input: PourBarInput = {
  pour, clock: iso => formatTime(iso, 'Europe/London'), now: Date.parse('2027-02-28T12:00:00Z'), compact: false, depositWaiting: false, cavities: 1,
}
const title = (bar: HTMLElement) => bar.title

describe('a pour bar (board-dom)', () => {
  it('shows a gang mould\'s casts as × N, and in its title', () => {
    const bar = pourBarElement({ ...input, cavities: 4 })
    expect(bar.querySelector('[data-testid="pour-cavities"]')!.textContent).toBe('× 4')
    expect(title(bar)).toContain('Ceiling roses · 4 casts · planned')
  })

  it('carries no count for a one-cavity mould', () => {
    const bar = pourBarElement(input)
    expect(bar.querySelector('[data-testid="pour-cavities"]')).toBeNull()
    expect(title(bar)).toContain('Ceiling roses · planned')
  })

  it('says the cycle\'s times in the workshop\'s clock, leads with the code (short in the week) and carries the deposit gate', () => {
    const bar = pourBarElement({ ...input, compact: true, depositWaiting: true })
    expect(title(bar)).toContain('prep 08:00, mix 08:15, demould 09:00–10:30, clean until 11:00')
    expect(title(bar)).toContain('waits for deposit')
    expect(bar.querySelector('[data-testid="pour-code"]')!.textContent).toBe('2602')
    expect(bar.querySelector('[data-testid="deposit-gate"]')).not.toBeNull()
    expect(pourBarElement(input).querySelector('[data-testid="pour-code"]')!.textContent).toBe('J-2602')
  })

  it('draws the phases as segments and marks the one under way as the clock moves on', () => {
    const bar = pourBarElement(input)
    // prep 08:00–08:15 of a three-hour slot: the first twelfth of the bar
    const prep = bar.querySelector<HTMLElement>('.phase-prep')!
    expect(prep.style.left).toBe('0%')
    expect(Number.parseFloat(prep.style.width)).toBeCloseTo(100 / 12, 9)
    expect(bar.dataset.phase).toBeUndefined()
    expect(bar.querySelector('.phase-now')).toBeNull()
    markPhase(bar, { ...input, now: Date.parse('2027-03-01T08:05:00Z') })
    expect(bar.dataset.phase).toBe('prep')
    expect(title(bar)).toContain('now mould prep')
    markPhase(bar, { ...input, now: Date.parse('2027-03-01T09:30:00Z') })
    expect(bar.dataset.phase).toBe('clean')
    expect([...bar.querySelectorAll('.phase-now')].map(s => (s as HTMLElement).dataset.phaseOf)).toEqual(['clean'])
    expect(title(bar)).toContain('now clean-out')
  })

  it('hands the calendar the very same nodes while a cell\'s content stays the same, and new ones after a clear', () => {
    const cells = new NodeCache()
    let built = 0
    const build = () => {
      built++
      return [pourBarElement(input)]
    }
    const first = cells.get('bar|7|1', build)
    expect(cells.get('bar|7|1', build)[0]).toBe(first[0])
    expect(cells.get('bar|7|2', build)[0]).not.toBe(first[0])
    cells.clear()
    expect(cells.get('bar|7|1', build)[0]).not.toBe(first[0])
    expect(built).toBe(3)
  })
})
