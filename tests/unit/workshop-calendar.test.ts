import { describe, it, expect } from 'vitest'
import { DateTime } from 'luxon'
import { PlasterInputError } from '#shared/utils/plaster'
import {
  PlanningInputError,
  addShiftHours,
  afterShiftTime,
  isInsideShift,
  nextShiftStart,
  shiftWindows,
  type WorkshopShiftCalendar,
} from '#shared/utils/workshop-calendar'
import { inputErrorField } from '../setup/input-errors'

const london: WorkshopShiftCalendar = { timezone: 'Europe/London', shiftStart: '07:30', shiftEnd: '16:00', workingDays: [1, 2, 3, 4, 5] }
const everyDay = { ...london, workingDays: [1, 2, 3, 4, 5, 6, 7] }
const iso = (d: Date) => d.toISOString()

// a planning error is a plaster input error too: the routes' 422 mapping catches it
const fieldOf = (fn: () => unknown) => inputErrorField(fn, PlanningInputError, PlasterInputError)

describe('shiftWindows', () => {
  it('lists the working days of a winter week at 07:30–16:00 GMT', () => {
    // 2026-12-07 is a Monday; London keeps GMT (UTC+0) in December.
    const w = shiftWindows({ ...london, from: new Date('2026-12-07T00:00:00Z'), to: new Date('2026-12-14T00:00:00Z') })
    expect(w.map(x => x.day)).toEqual(['2026-12-07', '2026-12-08', '2026-12-09', '2026-12-10', '2026-12-11'])
    expect(iso(w[0]!.start)).toBe('2026-12-07T07:30:00.000Z')
    expect(iso(w[0]!.end)).toBe('2026-12-07T16:00:00.000Z')
  })

  it('keeps 07:30 local in summer (BST, UTC+1)', () => {
    const w = shiftWindows({ ...london, from: new Date('2026-06-01T00:00:00Z'), to: new Date('2026-06-02T00:00:00Z') })
    expect(iso(w[0]!.start)).toBe('2026-06-01T06:30:00.000Z')
    expect(iso(w[0]!.end)).toBe('2026-06-01T15:00:00.000Z')
  })

  it('moves with the clocks on 2026-03-29 (spring forward) and 2026-10-25 (fall back)', () => {
    // UK clocks change at 01:00 UTC on the last Sunday of March and October (Summer Time Order).
    const spring = shiftWindows({ ...everyDay, from: new Date('2026-03-28T00:00:00Z'), to: new Date('2026-03-30T00:00:00Z') })
    expect(spring.map(w => [w.day, iso(w.start), iso(w.end)])).toEqual([
      ['2026-03-28', '2026-03-28T07:30:00.000Z', '2026-03-28T16:00:00.000Z'],
      ['2026-03-29', '2026-03-29T06:30:00.000Z', '2026-03-29T15:00:00.000Z'],
    ])
    const autumn = shiftWindows({ ...everyDay, from: new Date('2026-10-24T00:00:00Z'), to: new Date('2026-10-26T00:00:00Z') })
    expect(autumn.map(w => [w.day, iso(w.start), iso(w.end)])).toEqual([
      ['2026-10-24', '2026-10-24T06:30:00.000Z', '2026-10-24T15:00:00.000Z'],
      ['2026-10-25', '2026-10-25T07:30:00.000Z', '2026-10-25T16:00:00.000Z'],
    ])
    for (const w of [...spring, ...autumn]) expect(w.end.getTime() - w.start.getTime()).toBe(8.5 * 3_600_000)
  })

  it('agrees with the wall-clock conversion of Luxon for every day of 2026 in zones with odd offsets and changes', () => {
    const cases: [string, string, string][] = [
      ['Europe/London', '07:30', '16:00'],
      ['Europe/London', '01:30', '02:30'], // inside the spring gap and the autumn repeat
      ['America/New_York', '06:00', '14:30'],
      ['Australia/Lord_Howe', '00:30', '09:00'], // a half-hour DST change
      ['Asia/Kolkata', '08:00', '17:00'],
    ]
    for (const [timezone, shiftStart, shiftEnd] of cases) {
      const w = shiftWindows({ timezone, shiftStart, shiftEnd, workingDays: [1, 2, 3, 4, 5, 6, 7], from: new Date('2026-01-01T12:00:00Z'), to: new Date('2026-12-31T00:00:00Z') })
      expect(w.length).toBeGreaterThan(360)
      for (const x of w) {
        const [y, m, d] = x.day.split('-').map(Number) as [number, number, number]
        const at = (hhmm: string) => DateTime.fromObject({ year: y, month: m, day: d, hour: Number(hhmm.slice(0, 2)), minute: Number(hhmm.slice(3)) }, { zone: timezone }).toMillis()
        expect([x.day, x.start.getTime(), x.end.getTime()]).toEqual([x.day, at(shiftStart), at(shiftEnd)])
      }
    }
  })

  it('includes a shift already running at `from`, excludes one starting at `to`, and takes HH:MM:SS', () => {
    const w = shiftWindows({ ...london, shiftStart: '07:30:00', from: new Date('2026-12-07T12:00:00Z'), to: new Date('2026-12-08T07:30:00Z') })
    expect(w.map(x => x.day)).toEqual(['2026-12-07'])
  })

  it('names the bad field', () => {
    const range = { from: new Date('2026-12-07T00:00:00Z'), to: new Date('2026-12-08T00:00:00Z') }
    expect(fieldOf(() => shiftWindows({ ...london, ...range, timezone: 'Mars/Olympus' }))).toBe('timezone')
    expect(fieldOf(() => shiftWindows({ ...london, ...range, shiftStart: '7:30' }))).toBe('shiftStart')
    expect(fieldOf(() => shiftWindows({ ...london, ...range, shiftEnd: '25:00' }))).toBe('shiftEnd')
    expect(fieldOf(() => shiftWindows({ ...london, ...range, shiftEnd: '07:00' }))).toBe('shiftEnd')
    expect(fieldOf(() => shiftWindows({ ...london, ...range, workingDays: [] }))).toBe('workingDays')
    expect(fieldOf(() => shiftWindows({ ...london, ...range, workingDays: [0, 8] }))).toBe('workingDays')
    expect(fieldOf(() => shiftWindows({ ...london, from: new Date('nope'), to: range.to }))).toBe('from')
  })
})

describe('isInsideShift and nextShiftStart', () => {
  it('treats a shift as start ≤ t < end, and weekends as outside', () => {
    expect(isInsideShift(london, new Date('2026-12-07T07:30:00Z'))).toBe(true)
    expect(isInsideShift(london, new Date('2026-12-07T15:59:59Z'))).toBe(true)
    expect(isInsideShift(london, new Date('2026-12-07T16:00:00Z'))).toBe(false)
    expect(isInsideShift(london, new Date('2026-12-07T07:29:00Z'))).toBe(false)
    expect(isInsideShift(london, new Date('2026-12-12T10:00:00Z'))).toBe(false) // Saturday
  })

  it('finds the next start over a weekend and across the autumn change', () => {
    expect(iso(nextShiftStart(london, new Date('2026-12-11T17:00:00Z')))).toBe('2026-12-14T07:30:00.000Z')
    expect(iso(nextShiftStart(london, new Date('2026-12-07T07:30:00Z')))).toBe('2026-12-07T07:30:00.000Z')
    expect(iso(nextShiftStart(london, new Date('2026-12-07T07:31:00Z')))).toBe('2026-12-08T07:30:00.000Z')
    // Friday 2026-10-23 after work (BST) → Monday 2026-10-26, now GMT.
    expect(iso(nextShiftStart(london, new Date('2026-10-23T16:00:00Z')))).toBe('2026-10-26T07:30:00.000Z')
  })
})

// Shift time for people's work (fettling): our own worked examples on London's 07:30–16:00
// weekday shift (December: GMT, so local and UTC clocks agree), with a 12:00–12:30 break.
describe('addShiftHours and afterShiftTime', () => {
  const withBreak = { ...london, breaks: [{ start: '12:00', end: '12:30' }] }
  it('counts inside the shift only: 2 h from 15:30 end at 09:00 the next working morning', () => {
    expect(iso(addShiftHours(london, new Date('2026-12-07T15:30:00Z'), 2))).toBe('2026-12-08T09:00:00.000Z')
    // from Friday 15:00: one hour on Friday, one on Monday from 07:30
    expect(iso(addShiftHours(london, new Date('2026-12-11T15:00:00Z'), 2))).toBe('2026-12-14T08:30:00.000Z')
    // from before the shift: it starts at 07:30
    expect(iso(addShiftHours(london, new Date('2026-12-07T05:00:00Z'), 2))).toBe('2026-12-07T09:30:00.000Z')
    // inside a shift with room to spare: plain addition
    expect(iso(addShiftHours(london, new Date('2026-12-07T08:00:00Z'), 2))).toBe('2026-12-07T10:00:00.000Z')
  })

  it('skips the breaks and the closed days', () => {
    // 11:00 + 2 h of work: 11:00–12:00, break, 12:30–13:30
    expect(iso(addShiftHours(withBreak, new Date('2026-12-07T11:00:00Z'), 2))).toBe('2026-12-07T13:30:00.000Z')
    // from inside the break: the work starts when it ends
    expect(iso(addShiftHours(withBreak, new Date('2026-12-07T12:10:00Z'), 1))).toBe('2026-12-07T13:30:00.000Z')
    // Thursday 24 December after 15:00, the 25th and 28th closed: the rest on Tuesday 29th
    const closed = [{ fromDay: '2026-12-25', toDay: '2026-12-25' }, { fromDay: '2026-12-28', toDay: '2026-12-28' }]
    expect(iso(addShiftHours(london, new Date('2026-12-24T15:00:00Z'), 2, closed))).toBe('2026-12-29T08:30:00.000Z')
  })

  it('answers the instant itself for no time, and null when the windows run out', () => {
    const spans = [{ start: 0, end: 100, breaks: [[40, 60]] as [number, number][] }]
    expect(afterShiftTime(spans, 10, 0)).toBe(10)
    expect(afterShiftTime(spans, 10, 30)).toBe(40)
    expect(afterShiftTime(spans, 10, 31)).toBe(61)
    expect(afterShiftTime(spans, 10, 70)).toBe(100)
    expect(afterShiftTime(spans, 10, 71)).toBeNull()
  })
})
