import { describe, it, expect } from 'vitest'
import fc from 'fast-check'
import { GRADE_PRESETS, type PlasterGradePresetKey } from '#shared/utils/plaster'
import { pourTiming } from '#shared/utils/pour-timing'
import { planPours } from '#shared/utils/planner'
import type { PlanPoursInput, PlannerItem, PlannerMould, PlannerMouldState } from '#shared/types/planner'
import { DAY, MIN, expectInsideShifts, expectNoOverlaps } from './planner-helpers'

const presetKeys = Object.keys(GRADE_PRESETS) as PlasterGradePresetKey[]
const states: PlannerMouldState[] = ['ready', 'ready', 'ready', 'in_use', 'cleaning', 'repair', 'retired']

const calendarArb = fc.record({
  timezone: fc.constantFrom('Europe/London', 'America/New_York', 'UTC', 'Asia/Kolkata'),
  startMin: fc.integer({ min: 5 * 60, max: 9 * 60 + 45 }),
  lengthMin: fc.integer({ min: 4 * 60, max: 11 * 60 }),
  workingDays: fc.uniqueArray(fc.integer({ min: 1, max: 7 }), { minLength: 1, maxLength: 7 }),
}).map(({ timezone, startMin, lengthMin, workingDays }) => {
  const clock = (m: number) => `${String(Math.floor(m / 60)).padStart(2, '0')}:${String(m % 60).padStart(2, '0')}`
  return { timezone, shiftStart: clock(startMin), shiftEnd: clock(Math.min(startMin + lengthMin, 23 * 60 + 59)), workingDays }
})

const mouldArb = (id: string) => fc.record({
  state: fc.constantFrom(...states),
  prepMinutes: fc.integer({ min: 0, max: 30 }),
  cleanMinutes: fc.integer({ min: 0, max: 30 }),
  maxDwellMinutes: fc.constantFrom(0, 60, 120, 600, 960, 1440, 2000, 3000),
  pulls: fc.integer({ min: 0, max: 50 }),
  life: fc.option(fc.integer({ min: 0, max: 20 })),
}).map(({ life, ...m }): PlannerMould => ({ ...m, id, code: `M${id}`, benchId: null, expectedPulls: life === null ? null : m.pulls + life }))

const itemArb = (index: number, mouldIds: string[]) => fc.record({
  job: fc.integer({ min: 1, max: 3 }),
  dueDay: fc.option(fc.integer({ min: 1, max: 28 })),
  sampleReleased: fc.constantFrom(true, true, true, false),
  piecesRemaining: fc.integer({ min: 0, max: 15 }),
  moulds: fc.uniqueArray(fc.constantFrom(...mouldIds, 'unknown'), { minLength: 1, maxLength: 3 }),
  grade: fc.constantFrom(...presetKeys).map(k => GRADE_PRESETS[k]),
  share: fc.double({ min: 0, max: 1, noNaN: true }),
}).map(({ job, dueDay, moulds, grade, share, ...rest }): PlannerItem => ({
  ...rest,
  itemId: String(index + 1),
  jobId: `j${job}`,
  jobCode: `J-${job}`,
  dueOn: dueDay === null ? null : `2026-12-${String(dueDay).padStart(2, '0')}`,
  mouldIds: moulds,
  grade,
  consistency: grade.consistency.min + share * (grade.consistency.max - grade.consistency.min),
}))

const inputArb: fc.Arbitrary<PlanPoursInput> = fc.record({
  calendar: calendarArb,
  fromDay: fc.integer({ min: 0, max: 360 }),
  days: fc.integer({ min: 1, max: 10 }),
  mouldCount: fc.integer({ min: 1, max: 5 }),
  shopC: fc.integer({ min: -2, max: 35 }),
  casters: fc.option(fc.constantFrom<string[]>(['c1'], ['c1', 'c2'])),
  projectionDays: fc.integer({ min: 0, max: 20 }),
}).chain(({ calendar, fromDay, days, mouldCount, shopC, casters, projectionDays }) => {
  const ids = Array.from({ length: mouldCount }, (_, i) => String(i + 1))
  const from = new Date(Date.UTC(2026, 0, 1) + fromDay * DAY)
  const existing = fc.record({
    mouldId: fc.constantFrom(...ids),
    startMin: fc.integer({ min: 0, max: days * 24 * 60 }),
    length: fc.integer({ min: 10, max: 300 }),
  }).map(e => ({ mouldId: e.mouldId, slotStart: new Date(from.getTime() + e.startMin * MIN), slotEnd: new Date(from.getTime() + (e.startMin + e.length) * MIN) }))
  return fc.record({
    moulds: fc.tuple(...ids.map(mouldArb)),
    existingPours: fc.array(existing, { maxLength: 8 }),
    items: fc.integer({ min: 1, max: 6 }).chain(n => fc.tuple(...Array.from({ length: n }, (_, i) => itemArb(i, ids)))),
  }).map(({ moulds, existingPours, items }): PlanPoursInput => ({
    calendar,
    from,
    to: new Date(from.getTime() + days * DAY),
    moulds,
    existingPours,
    items,
    defaultShopTempC: shopC,
    options: { projectionDays, ...(casters ? { casters } : {}) },
  }))
})

describe('planPours properties', () => {
  it('never overlaps on a mould, never leaves the shift, and keeps every rule', () => {
    fc.assert(fc.property(inputArb, (input) => {
      const result = planPours(input)
      expectNoOverlaps(input, result)
      expectInsideShifts(input, result)
      const moulds = new Map(input.moulds.map(m => [m.id, m]))
      const items = new Map(input.items.map(i => [i.itemId, i]))
      const perMould = new Map<string, number>()
      const perItem = new Map<string, number>()
      for (const p of result.pours) {
        const m = moulds.get(p.mouldId)!
        const it = items.get(p.itemId)!
        expect(['repair', 'retired']).not.toContain(m.state)
        expect(it.sampleReleased).toBe(true)
        expect([...it.mouldIds, ...(it.alternativeMouldIds ?? [])]).toContain(p.mouldId)
        expect(p.slotStart.getTime()).toBeLessThan(input.to.getTime())
        // The board's own timing of the same pour agrees; an overnight slot runs on to the next morning.
        const t = pourTiming({ mixAt: p.mixAt, mould: m, grade: it.grade, consistency: it.consistency, slurryTempC: p.slurryTempC, setFactor: p.setFactor })
        expect([t.slotStart, t.demouldOpenAt, t.demouldCloseAt]).toEqual([p.slotStart, p.demouldOpenAt, p.demouldCloseAt])
        if (p.overnight) expect(p.slotEnd.getTime()).toBeGreaterThanOrEqual(t.slotEnd.getTime())
        else expect(p.slotEnd).toEqual(t.slotEnd)
        perMould.set(m.id, (perMould.get(m.id) ?? 0) + 1)
        perItem.set(it.itemId, (perItem.get(it.itemId) ?? 0) + 1)
      }
      for (const [id, n] of perMould) {
        const m = moulds.get(id)!
        if (m.expectedPulls !== null) expect(m.pulls + n).toBeLessThanOrEqual(Math.max(m.pulls, m.expectedPulls))
      }
      for (const [id, n] of perItem) expect(n).toBeLessThanOrEqual(items.get(id)!.piecesRemaining)
      for (const u of result.unplaced) {
        if (!items.get(u.itemId)!.sampleReleased) expect(u.reason).toBe('sample-awaiting-approval')
      }
    }))
  })

  it('orders each mould\'s pours by due date, and gives each caster one mix at a time', () => {
    fc.assert(fc.property(inputArb, (input) => {
      const result = planPours(input)
      const rank = new Map([...input.items].sort((a, b) => {
        const due = (x: PlannerItem) => x.dueOn ?? '9999-99-99'
        return due(a) < due(b) ? -1 : due(a) > due(b) ? 1 : a.jobCode < b.jobCode ? -1 : a.jobCode > b.jobCode ? 1 : Number(a.itemId) - Number(b.itemId)
      }).map((it, i) => [it.itemId, i]))
      const lastRank = new Map<string, number>()
      const mixes = new Map<string, number[]>()
      for (const p of [...result.pours].sort((a, b) => a.slotStart.getTime() - b.slotStart.getTime())) {
        const r = rank.get(p.itemId)!
        expect(r).toBeGreaterThanOrEqual(lastRank.get(p.mouldId) ?? 0)
        lastRank.set(p.mouldId, r)
        if (p.casterId) mixes.set(p.casterId, [...(mixes.get(p.casterId) ?? []), p.mixAt.getTime()])
      }
      for (const list of mixes.values()) {
        list.sort((a, b) => a - b)
        for (let i = 1; i < list.length; i++) expect(list[i]! - list[i - 1]!).toBeGreaterThanOrEqual(5 * MIN)
      }
      if (input.options?.casters) expect(result.pours.every(p => p.casterId !== null)).toBe(true)
    }))
  })
})
