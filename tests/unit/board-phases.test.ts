// The board's drawing of a pour's cycle and its lean wire form. Check values are worked by
// hand from the instants given here (pour-timing.ts defines the cycle: prep until mixAt, 5
// minutes of mixing, setting until the window opens, clean-out until the slot ends).
import { describe, expect, it } from 'vitest'
import { phaseAt, pourPhases, pourStateWord } from '#shared/utils/board-phases'
import { expandBoardPours } from '#shared/utils/board-lean'
import type { BoardData } from '#shared/types/board'

// a 100-minute slot: prep 10, mixing 5, setting 65, clean-out 20; window 80..120 (past the slot)
const at = (min: number) => new Date(Date.UTC(2027, 2, 1, 8, 0) + min * 60_000).toISOString()
const pour = { slotStart: at(0), mixAt: at(10), demouldOpenAt: at(80), demouldCloseAt: at(120), slotEnd: at(100) }

describe('pourPhases', () => {
  it('splits the slot into prep, mixing, setting and clean-out by their share of the bar', () => {
    const { phases, window } = pourPhases(pour)
    expect(phases.map(p => [p.phase, Math.round(p.leftPct), Math.round(p.widthPct)])).toEqual([
      ['prep', 0, 10], ['mixing', 10, 5], ['setting', 15, 65], ['clean', 80, 20],
    ])
    // the window opens at 80 % and is clipped at the bar's end
    expect([Math.round(window.leftPct), Math.round(window.widthPct)]).toEqual([80, 20])
  })

  it('leaves out an empty phase (a mould with no prep time)', () => {
    expect(pourPhases({ ...pour, mixAt: at(0) }).phases[0]!.phase).toBe('mixing')
  })

  it('names the phase under way, none before or after the slot', () => {
    expect(phaseAt(pour, Date.parse(at(-1)))).toBeNull()
    expect(phaseAt(pour, Date.parse(at(5)))).toBe('prep')
    expect(phaseAt(pour, Date.parse(at(12)))).toBe('mixing')
    expect(phaseAt(pour, Date.parse(at(40)))).toBe('setting')
    expect(phaseAt(pour, Date.parse(at(99)))).toBe('clean')
    expect(phaseAt(pour, Date.parse(at(100)))).toBeNull()
  })

  it('words the state, overdue first', () => {
    expect(pourStateWord({ state: 'setting', overdue: false })).toBe('setting')
    expect(pourStateWord({ state: 'setting', overdue: true })).toBe('overdue')
  })
})

describe('expandBoardPours', () => {
  it('rebuilds each pour from its ids, the lookups and its five instants', () => {
    const t = [pour.slotStart, pour.slotEnd, pour.mixAt, pour.demouldOpenAt, pour.demouldCloseAt].map(Date.parse) as [number, number, number, number, number]
    const data = {
      now: Date.parse(pour.mixAt) - 3_600_000,
      workshop: { timezone: 'UTC' },
      moulds: [{ id: 3, code: 'CB-12' }],
      lookups: { jobs: { 7: 'J-1' }, items: { 9: { jobId: 7, description: 'Corbel' } }, grades: { 2: 'Casting' }, people: { 5: 'Ada' } },
      // the wire's order: id, version, mould, item, caster, grade, lot, state, sample, consistency, set factor, five instants, plaster, water, warnings
      pours: [[1, 2, 3, 9, 5, 2, null, 'planned', false, 70, 1, ...t, 3, 2.1, []]],
    } as unknown as BoardData
    expect(expandBoardPours(data)[0]).toEqual({
      id: 1, version: 2, mouldId: 3, mouldCode: 'CB-12', jobItemId: 9, jobId: 7, jobCode: 'J-1', itemDescription: 'Corbel',
      casterId: 5, casterName: 'Ada', gradeId: 2, gradeName: 'Casting', lotId: null, state: 'planned', isSample: false,
      consistency: 70, setFactor: 1, ...pour, plasterKg: 3, waterKg: 2.1, warnings: [], overdue: false, situation: 'waiting',
    })
    // an hour past its mix time and never mixed: a missed start, named first among the warnings
    const late = expandBoardPours({ ...data, now: Date.parse(pour.mixAt) + 3_600_000 })[0]!
    expect(late).toMatchObject({ situation: 'missed_start', overdue: false })
    expect(late.warnings[0]).toMatch(/^Missed start: never mixed/)
    // poured and left past its window: an overdue demould
    const setting = data.pours[0]!.map((v, i) => (i === 7 ? 'setting' : v)) as BoardData['pours'][number]
    expect(expandBoardPours({ ...data, pours: [setting], now: Date.parse(pour.demouldCloseAt) + 60_000 })[0]).toMatchObject({ situation: 'overdue_demould', overdue: true })
  })
})
