import { describe, expect, it } from 'vitest'
import {
  MOULD_LIFE_FLAG_FRACTION,
  POUR_WASTE_PCT,
  boardClock,
  boardDayStart,
  boardLocalDay,
  lotStockKg,
  lotToOpen,
  mixesOverlap,
  mouldLifeFlag,
  pourBreakWarning,
  pourDwellWarning,
  pourOverdue,
  pourWarnings,
  requisitionLine,
  type PourWarningFacts,
} from '#shared/utils/board-rules'
import { boardDaySpan, boardRangeSchema } from '#shared/utils/pour-schemas'

const close = new Date('2027-03-01T12:00:00Z')
const min = (n: number) => n * 60_000
const calendar = { timezone: 'Europe/London', shiftStart: '07:30', shiftEnd: '16:00', workingDays: [1, 2, 3, 4, 5] }

describe('pourOverdue', () => {
  it('a mixing or setting pour is overdue once its window has closed', () => {
    for (const state of ['mixing', 'setting'] as const) {
      expect(pourOverdue({ state, demouldCloseAt: close }, new Date(close.getTime() + 1))).toBe(true)
      expect(pourOverdue({ state, demouldCloseAt: close }, close)).toBe(false)
    }
  })
  it('a planned pour is never an overdue demould: nothing is in the mould (a missed start)', () => {
    expect(pourOverdue({ state: 'planned', demouldCloseAt: close }, new Date(close.getTime() + min(600)))).toBe(false)
  })
  it('a demoulded or void pour is never overdue', () => {
    const later = new Date(close.getTime() + min(600))
    expect(pourOverdue({ state: 'demoulded', demouldCloseAt: close }, later)).toBe(false)
    expect(pourOverdue({ state: 'void', demouldCloseAt: close }, later)).toBe(false)
  })
})

describe('mould life and lots', () => {
  it('flags a mould from 90 % of its expected pulls, never one with no known life', () => {
    expect(MOULD_LIFE_FLAG_FRACTION).toBe(0.9)
    expect(mouldLifeFlag(134, 150)).toBe(false)
    expect(mouldLifeFlag(135, 150)).toBe(true) // 0.9 × 150
    expect(mouldLifeFlag(500, null)).toBe(false)
  })
  it('a lot holds bags × bag kg less what pours took', () => {
    expect(lotStockKg({ bagsReceived: 40, bagKg: 25 }, 120.5)).toBeCloseTo(879.5, 9)
  })
  it('two mixes overlap within the 5-minute gauging time', () => {
    const a = new Date('2027-03-01T09:00:00Z')
    expect(mixesOverlap(a, new Date(a.getTime() + min(4)))).toBe(true)
    expect(mixesOverlap(a, new Date(a.getTime() + min(5)))).toBe(false)
    expect(mixesOverlap(new Date(a.getTime() + min(3)), a)).toBe(true)
  })
  it('waste is 5 % (common practice)', () => {
    expect(POUR_WASTE_PCT).toBe(5)
  })
})

describe('pourWarnings', () => {
  const base: PourWarningFacts = {
    modelWarnings: [], dwell: null, casterClashes: [], casterName: 'Idris',
    mould: { code: 'CR-101', pulls: 10, expectedPulls: 150 }, mouldPlannedPours: 1, lot: null,
  }
  it('no facts, no warnings', () => {
    expect(pourWarnings(base, 'Europe/London')).toEqual([])
  })
  it('in order: model, dwell, caster, mould life, lot', () => {
    const w = pourWarnings({
      ...base,
      modelWarnings: ['cold slurry'],
      dwell: 'overnight',
      casterClashes: [{ mouldCode: 'CR-102', mixAt: new Date('2027-03-01T09:15:00Z') }],
      mould: { code: 'CR-101', pulls: 148, expectedPulls: 150 },
      mouldPlannedPours: 2,
      lot: { code: 'FC-1', leftKg: -12.34 },
    }, 'Europe/London')
    expect(w[0]).toBe('cold slurry')
    expect(w[1]).toBe('overnight')
    expect(w[2]).toContain('Idris is already gauging a mix for CR-102 at 09:15')
    expect(w[3]).toContain('CR-101 reaches its expected life')
    expect(w[4]).toContain('Lot FC-1 will not cover')
    expect(w[4]).toContain('12.3 kg short')
  })
  it('life warns at exactly the expected pulls, not one below', () => {
    expect(pourWarnings({ ...base, mould: { code: 'M', pulls: 148, expectedPulls: 150 }, mouldPlannedPours: 1 }, 'UTC')).toEqual([])
    expect(pourWarnings({ ...base, mould: { code: 'M', pulls: 149, expectedPulls: 150 }, mouldPlannedPours: 1 }, 'UTC')).toHaveLength(1)
  })
  it('a lot with exactly enough does not warn', () => {
    expect(pourWarnings({ ...base, lot: { code: 'L', leftKg: 0 } }, 'UTC')).toEqual([])
  })
})

describe('requisition', () => {
  it('adds the day\'s plaster and rounds up to whole bags; water in litres at 1 kg/L', () => {
    const line = requisitionLine({ gradeId: 1, gradeName: 'Fine casting', bagKg: 25 },
      [{ plasterKg: 10, waterKg: 7 }, { plasterKg: 15.5, waterKg: 10.85 }])
    expect(line.plasterKg).toBeCloseTo(25.5, 9)
    expect(line.bags).toBe(2)
    expect(line.waterLitres).toBeCloseTo(17.85, 9)
    expect(requisitionLine({ gradeId: 1, gradeName: 'x', bagKg: 25 }, [{ plasterKg: 50, waterKg: 35 }]).bags).toBe(2)
  })
  it('opens the first received lot still in date with stock (first in, first out)', () => {
    const lots = [
      { lotId: 3, lotCode: 'new', receivedOn: '2027-02-01', useBy: '2027-08-01', stockKg: 1000 },
      { lotId: 1, lotCode: 'expired', receivedOn: '2026-06-01', useBy: '2027-01-01', stockKg: 300 },
      { lotId: 2, lotCode: 'empty', receivedOn: '2026-09-01', useBy: '2027-06-01', stockKg: 0 },
      { lotId: 4, lotCode: 'older', receivedOn: '2026-12-01', useBy: null, stockKg: 50 },
    ]
    expect(lotToOpen(lots, '2027-03-01')?.lotCode).toBe('older')
    expect(lotToOpen(lots.slice(0, 3), '2027-03-01')?.lotCode).toBe('new')
    expect(lotToOpen(lots.slice(1, 3), '2027-03-01')).toBeNull()
    expect(lotToOpen([{ ...lots[1]!, useBy: '2027-03-01' }], '2027-03-01')?.lotCode).toBe('expired') // in date on its use-by day
  })
})

describe('days and clocks in the workshop zone', () => {
  it('local day and clock, across the zone', () => {
    expect(boardLocalDay(new Date('2027-07-01T23:30:00Z'), 'Europe/London')).toBe('2027-07-02') // BST
    expect(boardLocalDay(new Date('2027-01-01T23:30:00Z'), 'Europe/London')).toBe('2027-01-01')
    // the house day-and-time style (workshop-format.ts), 24-hour clock in both locales
    expect(boardClock(new Date('2027-07-01T08:05:00Z'), 'Europe/London')).toBe('Thu 1 Jul 2027 09:05')
    expect(boardClock(new Date('2027-07-01T18:05:00Z'), 'America/New_York', 'en-US')).toBe('Thu, Jul 1, 2027 14:05')
  })
  it('a day starts at local midnight', () => {
    expect(boardDayStart('2027-07-01', 'Europe/London').toISOString()).toBe('2027-06-30T23:00:00.000Z')
    expect(boardDayStart('2027-01-15', 'Europe/London').toISOString()).toBe('2027-01-15T00:00:00.000Z')
  })
  it('the board range counts days inclusively, at most 31, from ≤ to, real days only', () => {
    expect(boardDaySpan('2027-01-01', '2027-01-31')).toBe(31)
    expect(boardRangeSchema.safeParse({ from: '2027-01-01', to: '2027-01-31' }).success).toBe(true)
    expect(boardRangeSchema.safeParse({ from: '2027-01-01', to: '2027-02-01' }).success).toBe(false)
    expect(boardRangeSchema.safeParse({ from: '2027-01-02', to: '2027-01-01' }).success).toBe(false)
    expect(boardRangeSchema.safeParse({ from: '2027-02-30', to: '2027-03-01' }).success).toBe(false)
  })
})

describe('pourDwellWarning', () => {
  // Monday 1 March 2027, shift 07:30–16:00 GMT; next shift Tuesday 07:30.
  const mixAt = new Date('2027-03-01T15:30:00Z')
  it('a window opening by the shift end is fine', () => {
    expect(pourDwellWarning(calendar, { mixAt, demouldOpenAt: new Date('2027-03-01T16:00:00Z'), demouldCloseAt: new Date('2027-03-01T17:00:00Z') })).toBeNull()
  })
  it('after the shift, a mould that cannot hold the cast overnight warns', () => {
    const w = pourDwellWarning(calendar, { mixAt, demouldOpenAt: new Date('2027-03-01T16:10:00Z'), demouldCloseAt: new Date('2027-03-01T17:10:00Z') })
    expect(w).toContain('cannot hold the cast overnight')
  })
  it('after the shift, a mould that holds it until the next shift start is fine', () => {
    expect(pourDwellWarning(calendar, { mixAt, demouldOpenAt: new Date('2027-03-01T16:10:00Z'), demouldCloseAt: new Date('2027-03-02T07:30:00Z') })).toBeNull()
  })
  it('Friday evening needs to hold until Monday', () => {
    const fri = new Date('2027-03-05T15:40:00Z')
    const w = pourDwellWarning(calendar, { mixAt: fri, demouldOpenAt: new Date('2027-03-05T16:10:00Z'), demouldCloseAt: new Date('2027-03-06T07:30:00Z') })
    expect(w).toContain('cannot hold')
  })
})

describe('a pour placed by hand with its mix in a break', () => {
  // an invented shop: 07:30–16:00 Monday to Friday, tea 10:00–10:20, lunch 12:30–13:00, London
  const cal = { timezone: 'Europe/London', shiftStart: '07:30', shiftEnd: '16:00', workingDays: [1, 2, 3, 4, 5], breaks: [{ start: '10:00', end: '10:20' }, { start: '12:30', end: '13:00' }] }
  it('warns when the gauging touches a break, naming the break and the clear times', () => {
    // Wed 3 Mar 2027, GMT: 10:10 local is inside the tea break
    expect(pourBreakWarning(cal, new Date('2027-03-03T10:10:00Z'), cal.timezone, 5))
      .toBe('The mix at 10:10 runs into the 10:00–10:20 break: mix at 10:20 or before 09:55 instead.')
    // 12:27 + 5 minutes of gauging runs into lunch at 12:30
    expect(pourBreakWarning(cal, new Date('2027-03-03T12:27:00Z'), cal.timezone, 5)).toMatch(/^The mix at 12:27 runs into the 12:30–13:00 break/)
  })
  it('is quiet when the gauging ends as the break starts or starts as it ends, and without breaks', () => {
    expect(pourBreakWarning(cal, new Date('2027-03-03T09:55:00Z'), cal.timezone, 5)).toBeNull()
    expect(pourBreakWarning(cal, new Date('2027-03-03T10:20:00Z'), cal.timezone, 5)).toBeNull()
    expect(pourBreakWarning({ ...cal, breaks: [] }, new Date('2027-03-03T10:10:00Z'), cal.timezone, 5)).toBeNull()
  })
  it('follows the local clock across the change to summer time', () => {
    // Wed 31 Mar 2027 is BST (UTC+1): 10:10 local is 09:10Z
    expect(pourBreakWarning(cal, new Date('2027-03-31T09:10:00Z'), cal.timezone, 5)).toMatch(/^The mix at 10:10 runs into the 10:00–10:20 break/)
    expect(pourBreakWarning(cal, new Date('2027-03-31T10:10:00Z'), cal.timezone, 5)).toBeNull()
  })
})
