import { describe, it, expect } from 'vitest'
import { PlanningInputError } from '#shared/utils/workshop-calendar'
import { planPours } from '#shared/utils/planner'
import type { PlanPoursInput } from '#shared/types/planner'
import { MIN, baseInput, expectInsideShifts, expectNoOverlaps, item, mould } from './planner-helpers'
import { inputErrorField } from '../setup/input-errors'

// Timing used throughout (pour-timing.test.ts checks it): the beta casting preset at 70 and a
// 20 °C shop opens 30 min after mixing ends, + 5 min mixing = 35 min after mixAt. A mould with
// 10 min prep and 10 min clean then cycles every 55 min: 07:30, 08:25, … 14:50 is the last of
// 9 pours whose window opens by 16:00.
const at = (iso: string) => new Date(iso)
const hhmm = (d: Date) => d.toISOString().slice(11, 16)

function plan(over: Partial<PlanPoursInput>) {
  const input = baseInput(over)
  const result = planPours(input)
  expectNoOverlaps(input, result)
  expectInsideShifts(input, result, input.options?.pourMinutes)
  return { input, result }
}

const fieldOf = (fn: () => unknown) => inputErrorField(fn, PlanningInputError)

describe('planPours: order and cycle', () => {
  it('fills a mould on its 55-minute cycle, 9 pours a day inside the shift', () => {
    const { result } = plan({ items: [item('1', { piecesRemaining: 12 })] })
    const monday = result.pours.filter(p => p.day === '2026-12-07')
    expect(monday.map(p => hhmm(p.slotStart))).toEqual(['07:30', '08:25', '09:20', '10:15', '11:10', '12:05', '13:00', '13:55', '14:50'])
    const last = monday[8]!
    expect([hhmm(last.mixAt), hhmm(last.demouldOpenAt), hhmm(last.slotEnd)]).toEqual(['15:00', '15:35', '15:45'])
    expect(result.pours.slice(9).map(p => [p.day, hhmm(p.slotStart)])).toEqual([['2026-12-08', '07:30'], ['2026-12-08', '08:25'], ['2026-12-08', '09:20']])
    expect(result.pours.every(p => !p.overnight && p.warnings.length === 0)).toBe(true)
  })

  it('places earliest due date first; ties by job code, then item id (numeric ids as numbers)', () => {
    const items = [
      item('1', { jobId: 'b', jobCode: 'J-B', dueOn: '2026-12-20', piecesRemaining: 2 }),
      item('2', { jobId: 'a', jobCode: 'J-A', dueOn: '2026-12-10', piecesRemaining: 2 }),
      item('3', { jobId: 'c', jobCode: 'J-C', dueOn: null }),
      item('10', { jobId: 'z', jobCode: 'J-0', dueOn: '2026-12-20' }),
      item('9', { jobId: 'z', jobCode: 'J-0', dueOn: '2026-12-20' }),
    ]
    const { result } = plan({ items })
    expect(result.pours.map(p => p.itemId)).toEqual(['2', '2', '9', '10', '1', '1', '3'])
    expect(result.jobs.map(j => j.jobCode)).toEqual(['J-A', 'J-0', 'J-B', 'J-C'])
  })

  it('goes round existing pours on the mould and starts no earlier than startAt', () => {
    const existingPours = [
      { mouldId: '1', slotStart: at('2026-12-07T08:00:00Z'), slotEnd: at('2026-12-07T09:00:00Z') },
      { mouldId: '1', slotStart: at('2026-12-07T10:30:00Z'), slotEnd: at('2026-12-07T11:00:00Z') },
    ]
    const { result } = plan({ existingPours, items: [item('1', { piecesRemaining: 3 })] })
    expect(result.pours.map(p => hhmm(p.slotStart))).toEqual(['09:00', '11:00', '11:55'])
    const later = plan({ items: [item('1')], options: { startAt: at('2026-12-07T10:00:30Z') } }).result
    expect(hhmm(later.pours[0]!.slotStart)).toBe('10:01') // rounded up to the minute
  })

  it('keeps the shift in local time across the spring clock change', () => {
    // Friday 2026-03-27 is GMT; Monday 2026-03-30 is BST, so 07:30 local is 06:30 UTC.
    const { result } = plan({ from: at('2026-03-27T00:00:00Z'), to: at('2026-03-31T00:00:00Z'), items: [item('1', { piecesRemaining: 10 })] })
    expect(result.pours.map(p => [p.day, p.slotStart.toISOString()]).filter((_, i) => i % 9 === 0)).toEqual([
      ['2026-03-27', '2026-03-27T07:30:00.000Z'],
      ['2026-03-30', '2026-03-30T06:30:00.000Z'],
    ])
  })

  it('uses the day\'s shop temperature and skips a day below freezing', () => {
    const shopTempByDay = { '2026-12-07': 10, '2026-12-08': -2 }
    const { result } = plan({ shopTempByDay, items: [item('1', { piecesRemaining: 12 })] })
    const minutes = (p: { mixAt: Date; demouldOpenAt: Date }) => (p.demouldOpenAt.getTime() - p.mixAt.getTime()) / MIN
    const monday = result.pours.filter(p => p.day === '2026-12-07')
    expect(monday).toHaveLength(8) // 30 × 1.3 (preset at 10 °C) + 5 = 44 min: a 64-minute cycle
    expect(monday.every(p => minutes(p) === 44 && p.slurryTempC === 10)).toBe(true)
    expect(result.pours.some(p => p.day === '2026-12-08')).toBe(false)
    expect(result.pours.filter(p => p.day === '2026-12-09').map(minutes)).toEqual([35, 35, 35, 35])
  })
})

describe('planPours: dwell and moulds', () => {
  it('lets a mould that holds a cast overnight take a last pour after hours, and ends its slot next morning', () => {
    const moulds = [mould('1', { maxDwellMinutes: 960 })]
    const { result } = plan({ moulds, items: [item('1', { piecesRemaining: 11 })] })
    const tenth = result.pours[9]!
    // 15:45 prep, 15:55 gauging (ends 16:00), opens 16:30, holds until 16:30 + 16 h = 08:30 ≥ 07:30.
    expect([tenth.day, hhmm(tenth.slotStart), hhmm(tenth.demouldOpenAt), tenth.overnight]).toEqual(['2026-12-07', '15:45', '16:30', true])
    expect(tenth.demouldCloseAt).toEqual(at('2026-12-08T08:30:00Z'))
    expect(tenth.slotEnd).toEqual(at('2026-12-08T07:40:00Z')) // out at the next shift start, + 10 min clean
    expect(tenth.warnings.some(w => w.includes('stays in the mould until the shift of 2026-12-08'))).toBe(true)
    expect(hhmm(result.pours[10]!.slotStart)).toBe('07:40')
  })

  it('keeps a short-dwell mould to windows opening by the shift end, and none over a weekend', () => {
    const short = plan({ items: [item('1', { piecesRemaining: 30 })] }).result
    expect(short.pours.some(p => p.overnight)).toBe(false)
    // From Friday: a 16 h dwell cannot bridge to Monday, so Friday stops at 9 pours.
    const friday = plan({
      from: at('2026-12-11T00:00:00Z'),
      to: at('2026-12-12T00:00:00Z'),
      moulds: [mould('1', { maxDwellMinutes: 960 })],
      items: [item('1', { piecesRemaining: 10, dueOn: '2026-12-11' })],
    }).result
    expect(friday.pours).toHaveLength(9)
    expect(friday.pours.some(p => p.overnight)).toBe(false)
    expect(friday.jobs[0]).toMatchObject({ piecesPlanned: 9, finishesOn: null, projectedDate: '2026-12-14', onTime: false })
  })

  it('prefers a same-day placement without the overnight note to an earlier one with it', () => {
    const moulds = [mould('A', { prepMinutes: 30, maxDwellMinutes: 960 }), mould('B', { prepMinutes: 0 })]
    const busy = (id: string, end: string) => ({ mouldId: id, slotStart: at('2026-12-07T07:30:00Z'), slotEnd: at(`2026-12-07T${end}:00Z`) })
    const both = plan({ moulds, existingPours: [busy('A', '15:00'), busy('B', '15:20')], items: [item('1', { mouldIds: ['A', 'B'] })] })
    expect(both.result.pours.map(p => [p.mouldId, hhmm(p.slotStart), p.overnight])).toEqual([['B', '15:20', false]])
    const onlyA = plan({ moulds, existingPours: [busy('A', '15:00')], items: [item('1', { mouldIds: ['A'] })] })
    expect(onlyA.result.pours.map(p => [p.mouldId, hhmm(p.slotStart), p.overnight])).toEqual([['A', '15:00', true]])
  })

  it('never uses a mould in repair or retired, and says so', () => {
    const moulds = [mould('1', { state: 'repair' }), mould('2', { state: 'retired' }), mould('3')]
    const items = [item('1', { mouldIds: ['1', '2', '3'], piecesRemaining: 3 }), item('2', { mouldIds: ['1'], jobId: 'j2', jobCode: 'J-002' })]
    const { result } = plan({ moulds, items })
    expect(result.pours.map(p => p.mouldId)).toEqual(['3', '3', '3'])
    expect(result.moulds.map(m => [m.mouldId, m.reason])).toEqual([['1', 'repair'], ['2', 'retired']])
    expect(result.unplaced).toEqual([expect.objectContaining({ itemId: '2', reason: 'no-usable-mould', pieces: 1 })])
  })

  it('stops a mould at its expected life and moves on to another mould of the profile', () => {
    const moulds = [mould('1', { pulls: 95, expectedPulls: 100 }), mould('2', { code: 'spare', pulls: 0, expectedPulls: 3 })]
    const alone = plan({ moulds, items: [item('1', { piecesRemaining: 10 })] }).result
    expect(alone.pours).toHaveLength(5) // 95 + 5 reaches 100
    expect(alone.unplaced).toEqual([expect.objectContaining({ itemId: '1', reason: 'mould-life-reached', pieces: 5 })])
    expect(alone.moulds).toEqual([expect.objectContaining({ mouldId: '1', reason: 'expected-life' })])
    expect(alone.jobs[0]).toMatchObject({ piecesPlanned: 5, projectedDate: null, onTime: false })
    const shared = plan({ moulds, items: [item('1', { piecesRemaining: 8, mouldIds: ['1'], alternativeMouldIds: ['2'] })] }).result
    expect(shared.pours.filter(p => p.mouldId === '1')).toHaveLength(5)
    expect(shared.pours.filter(p => p.mouldId === '2')).toHaveLength(3)
    expect(shared.unplaced).toEqual([])
  })

  it('books one caster for one mix at a time, existing mixes included', () => {
    const moulds = [mould('1'), mould('2')]
    const existing = { mouldId: '9', slotStart: at('2026-12-07T07:30:00Z'), slotEnd: at('2026-12-07T08:30:00Z'), casterId: 'c1', mixAt: at('2026-12-07T07:40:00Z') }
    const { result } = plan({ moulds, existingPours: [existing], items: [item('1', { piecesRemaining: 6, mouldIds: ['1', '2'] })], options: { casters: ['c1'] } })
    expect(result.pours.every(p => p.casterId === 'c1')).toBe(true)
    const mixes = [existing.mixAt, ...result.pours.map(p => p.mixAt)].map(d => d.getTime()).sort((a, b) => a - b)
    for (let i = 1; i < mixes.length; i++) expect(mixes[i]! - mixes[i - 1]!).toBeGreaterThanOrEqual(5 * MIN)
    expect(hhmm(result.pours[0]!.mixAt)).toBe('07:45')
  })
})

describe('planPours: jobs, samples and the projection', () => {
  it('reports a job that cannot finish by its due date with the date it would', () => {
    const moulds = [mould('1'), mould('2')]
    const items = [
      item('1', { jobId: 'late', jobCode: 'J-LATE', dueOn: '2026-12-08', piecesRemaining: 50 }),
      item('2', { jobId: 'ok', jobCode: 'J-OK', dueOn: '2026-12-10', piecesRemaining: 3, mouldIds: ['2'] }),
    ]
    const { result } = plan({ moulds, items })
    expect(result.jobs).toEqual([
      { jobId: 'late', jobCode: 'J-LATE', dueOn: '2026-12-08', piecesPlanned: 45, piecesRemaining: 50, finishesOn: null, onTime: false, projectedDate: '2026-12-14', readyAt: expect.any(Date), waitsFor: null, note: null },
      { jobId: 'ok', jobCode: 'J-OK', dueOn: '2026-12-10', piecesPlanned: 3, piecesRemaining: 3, finishesOn: '2026-12-07', onTime: true, projectedDate: '2026-12-07', readyAt: expect.any(Date), waitsFor: null, note: null },
    ])
    expect(result.pours.every(p => p.slotStart < at('2026-12-12T00:00:00Z'))).toBe(true)
  })

  it('gives up past the projection horizon and says why', () => {
    const { result } = plan({ items: [item('1', { piecesRemaining: 50 })], options: { projectionDays: 0 } })
    expect(result.pours).toHaveLength(45)
    expect(result.unplaced).toEqual([expect.objectContaining({ reason: 'no-slot-in-horizon', pieces: 5 })])
    expect(result.jobs[0]).toMatchObject({ projectedDate: null, onTime: false })
  })

  it('leaves a job waiting for sample approval off the board, with the reason', () => {
    const items = [item('1', { sampleReleased: false, piecesRemaining: 4 }), item('2', { jobId: 'j2', jobCode: 'J-002' })]
    const { result } = plan({ items })
    expect(result.pours.map(p => p.itemId)).toEqual(['2'])
    expect(result.unplaced).toEqual([{ itemId: '1', jobId: 'j1', reason: 'sample-awaiting-approval', pieces: 4, message: expect.stringContaining('sample') }])
    expect(result.jobs.find(j => j.jobId === 'j1')).toMatchObject({ piecesPlanned: 0, onTime: false, projectedDate: null, finishesOn: null })
  })
})

describe('planPours: input', () => {
  it('names the first bad field', () => {
    expect(fieldOf(() => planPours(baseInput({ moulds: [mould('1', { state: 'broken' as never })] })))).toBe('moulds[0].state')
    expect(fieldOf(() => planPours(baseInput({ moulds: [mould('1'), mould('1')] })))).toBe('moulds')
    expect(fieldOf(() => planPours(baseInput({ to: at('2026-12-01T00:00:00Z') })))).toBe('to')
    expect(fieldOf(() => planPours(baseInput({ items: [item('1', { dueOn: '8/12/2026' })] })))).toBe('items[0].dueOn')
    expect(fieldOf(() => planPours(baseInput({ items: [item('1', { consistency: 5 })] })))).toBe('items[0].consistency')
    expect(fieldOf(() => planPours(baseInput({ shopTempByDay: { '2026-12-07': 80 } })))).toBe('shopTempByDay.2026-12-07')
  })
})

describe('multi-cavity moulds in the planner', () => {
  it('one pour on a 4-cavity mould makes 4 pieces toward the item: 10 pieces take 3 pours', () => {
    const result = planPours(baseInput({ moulds: [mould('1', { cavities: 4 })], items: [item('i1', { piecesRemaining: 10 })] }))
    expect(result.pours).toHaveLength(3)
    expect(result.pours.map(p => p.pieces)).toEqual([4, 4, 2])
    expect(result.jobs[0]!.piecesPlanned).toBe(10)
    expect(result.unplaced).toEqual([])
  })

  it('a single-cavity mould still takes a pour per piece', () => {
    const result = planPours(baseInput({ items: [item('i1', { piecesRemaining: 3 })] }))
    expect(result.pours).toHaveLength(3)
    expect(result.pours.every(p => p.pieces === 1)).toBe(true)
  })
})
