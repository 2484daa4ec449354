// Fixtures and invariant checks shared by the planner's example and property tests.
import { expect } from 'vitest'
import { GRADE_PRESETS } from '#shared/utils/plaster'
import { shiftWindows, type WorkshopShiftCalendar } from '#shared/utils/workshop-calendar'
import type { PlanPoursInput, PlanPoursResult, PlannerItem, PlannerMould } from '#shared/types/planner'

export const london: WorkshopShiftCalendar = { timezone: 'Europe/London', shiftStart: '07:30', shiftEnd: '16:00', workingDays: [1, 2, 3, 4, 5] }
export const beta = GRADE_PRESETS['beta-casting']
export const MIN = 60_000
export const DAY = 86_400_000

export function mould(id: string, over: Partial<PlannerMould> = {}): PlannerMould {
  return { id, code: `M${id}`, benchId: 'b1', state: 'ready', prepMinutes: 10, cleanMinutes: 10, maxDwellMinutes: 120, pulls: 0, expectedPulls: null, ...over }
}

export function item(itemId: string, over: Partial<PlannerItem> = {}): PlannerItem {
  return {
    itemId,
    jobId: 'j1',
    jobCode: 'J-001',
    dueOn: '2026-12-31',
    sampleReleased: true,
    piecesRemaining: 1,
    mouldIds: ['1'],
    grade: beta,
    consistency: 70,
    ...over,
  }
}

/** Monday 2026-12-07 to Saturday 2026-12-12: five working days, GMT. */
export function baseInput(over: Partial<PlanPoursInput> = {}): PlanPoursInput {
  return {
    calendar: london,
    from: new Date('2026-12-07T00:00:00Z'),
    to: new Date('2026-12-12T00:00:00Z'),
    moulds: [mould('1')],
    existingPours: [],
    items: [],
    ...over,
  }
}

/** Every pair of pours on one mould, proposed and existing, is disjoint (half-open slots). */
export function expectNoOverlaps(input: PlanPoursInput, result: PlanPoursResult): void {
  const byMould = new Map<string, [number, number, string][]>()
  const add = (id: string, s: Date, e: Date, what: string) => {
    byMould.set(id, [...(byMould.get(id) ?? []), [s.getTime(), e.getTime(), what]])
  }
  input.existingPours.forEach((p, i) => add(p.mouldId, p.slotStart, p.slotEnd, `existing ${i}`))
  result.pours.forEach((p, i) => add(p.mouldId, p.slotStart, p.slotEnd, `proposed ${i}`))
  for (const [id, list] of byMould) {
    for (let a = 0; a < list.length; a++) {
      for (let b = a + 1; b < list.length; b++) {
        const [s1, e1, w1] = list[a]!
        const [s2, e2, w2] = list[b]!
        if (w1.startsWith('existing') && w2.startsWith('existing')) continue
        expect(s1 < e2 && s2 < e1, `mould ${id}: ${w1} overlaps ${w2}`).toBe(false)
      }
    }
  }
}

/** Prep starts inside its day's shift, gauging ends by the shift end, the window opens by then unless held overnight. */
export function expectInsideShifts(input: PlanPoursInput, result: PlanPoursResult, pourMinutes = 5): void {
  const wins = shiftWindows({ ...input.calendar, from: input.from, to: new Date(input.to.getTime() + 30 * DAY) })
  const byDay = new Map(wins.map((w, i) => [w.day, i]))
  for (const p of result.pours) {
    const i = byDay.get(p.day)
    expect(i, `pour on ${p.day} is on a working day`).toBeDefined()
    const w = wins[i!]!
    expect(p.slotStart.getTime()).toBeGreaterThanOrEqual(w.start.getTime())
    expect(p.slotStart.getTime()).toBeGreaterThanOrEqual(input.from.getTime())
    expect(p.mixAt.getTime() + pourMinutes * MIN).toBeLessThanOrEqual(w.end.getTime())
    if (p.overnight) {
      const next = wins[i! + 1]!
      expect(p.demouldOpenAt.getTime()).toBeGreaterThan(w.end.getTime())
      expect(p.demouldCloseAt.getTime()).toBeGreaterThanOrEqual(next.start.getTime())
      expect(p.slotEnd.getTime()).toBeGreaterThanOrEqual(next.start.getTime())
    }
    else {
      expect(p.demouldOpenAt.getTime()).toBeLessThanOrEqual(w.end.getTime())
    }
  }
}
