// The board's time axis (shared/utils/board-axis.ts): the days and hours a view shows and where
// an instant falls on it, the one reckoning of the calendar and the server's sketch. Expected
// values are worked by hand from the rules (shift hours of working days, widened to any pour
// outside them); the zone's offsets are the IANA rules Node's Intl carries (Europe/London: BST
// from 01:00 UTC on the last Sunday of March, EU Directive 2000/84/EC).
import { describe, expect, it } from 'vitest'
import { benchOrder, boardAxis, firstScreenMoulds, FIRST_SCREEN_FROM_POURS, FIRST_SCREEN_ROWS, rulerDayLabel, viewHours } from '#shared/utils/board-axis'

const shop = { timezone: 'Europe/London', shiftStart: '07:30', shiftEnd: '16:00', workingDays: [1, 2, 3, 4, 5] }
const pour = (slotStart: string, slotEnd: string, state = 'planned') => ({ state, slotStart, slotEnd })

describe('the board\'s axis', () => {
  it('shows the shift\'s whole hours of the working days, from Monday', () => {
    const h = viewHours(shop, [])
    expect(h).toMatchObject({ firstHour: 7, lastHour: 16, firstDay: 1 })
    expect([...h.shownDays].sort()).toEqual([1, 2, 3, 4, 5])
    // Wednesday 31 March 2027 (BST, UTC+1): the week from Monday 29 March, five days of 9 hours
    const a = boardAxis(shop, [], 'week', '2027-03-31')
    expect(a.days).toEqual(['2027-03-29', '2027-03-30', '2027-03-31', '2027-04-01', '2027-04-02'])
    expect(a.slots).toBe(45)
    // Tuesday 09:00 BST is 08:00 UTC: one day and two hours of 45 hours in
    expect(a.at('2027-03-30T08:00:00Z')).toBeCloseTo(11 / 45, 10)
    // before the first hour: the start of that day; after the last: the end of it
    expect(a.at('2027-03-30T04:00:00Z')).toBeCloseTo(9 / 45, 10)
    expect(a.at('2027-03-30T18:00:00Z')).toBeCloseTo(18 / 45, 10)
    // Saturday is not shown: it falls at the end of the view
    expect(a.at('2027-04-03T10:00:00Z')).toBe(1)
  })

  it('widens the view to a pour at night or on a day off, and leaves void pours out', () => {
    const night = pour('2027-03-30T04:00:00Z', '2027-03-30T05:30:00Z') // 05:00-06:30 BST, Tuesday
    const saturday = pour('2027-04-03T09:00:00Z', '2027-04-03T10:00:00Z') // 10:00-11:00 BST
    const voided = pour('2027-03-28T00:30:00Z', '2027-03-28T02:00:00Z', 'void') // a Sunday night, void
    const h = viewHours(shop, [night, saturday, voided])
    expect(h).toMatchObject({ firstHour: 5, lastHour: 16 })
    expect([...h.shownDays].sort()).toEqual([1, 2, 3, 4, 5, 6])
    const a = boardAxis(shop, [night, saturday, voided], 'week', '2027-03-29')
    expect(a.days.at(-1)).toBe('2027-04-03')
    expect(a.slots).toBe(6 * 11)
    expect(a.at(saturday.slotStart)).toBeCloseTo((5 * 11 + 5) / 66, 10)
  })

  it('starts the week on the first day the shop works, and reads the wall clock across the change to summer time', () => {
    const tueToSat = { ...shop, workingDays: [2, 3, 4, 5, 6] }
    expect(viewHours(tueToSat, []).firstDay).toBe(2)
    const a = boardAxis(tueToSat, [], 'week', '2027-03-29') // a Monday: the week began Tuesday 23rd
    expect(a.days).toEqual(['2027-03-23', '2027-03-24', '2027-03-25', '2027-03-26', '2027-03-27'])
    // the day view of Sunday 28 March 2027, BST from 01:00 UTC: 08:00 on the wall is 07:00 UTC
    const day = boardAxis(shop, [], 'day', '2027-03-28')
    expect(day.days).toEqual(['2027-03-28'])
    expect(day.slots).toBe(9 * 4)
    expect(day.at('2027-03-28T07:00:00Z')).toBeCloseTo(1 / 9, 10)
  })

  it('draws a large board\'s first screen first: the first rows in bench and code order', () => {
    const moulds = [
      { id: 1, code: 'B-2', benchName: 'Long' }, { id: 2, code: 'A-9', benchName: null },
      { id: 3, code: 'A-1', benchName: 'Long' }, { id: 4, code: 'Z-1', benchName: 'Centre' },
    ]
    expect(benchOrder(moulds).map(m => m.id)).toEqual([4, 3, 1, 2])
    expect(firstScreenMoulds(benchOrder(moulds), FIRST_SCREEN_FROM_POURS - 1)).toBeNull()
    const many = Array.from({ length: 30 }, (_, i) => ({ id: i, code: `M-${String(i).padStart(2, '0')}`, benchName: 'Bench' }))
    expect([...firstScreenMoulds(many, FIRST_SCREEN_FROM_POURS)!]).toEqual(many.slice(0, FIRST_SCREEN_ROWS).map(m => m.id))
  })

  it('names the ruler\'s days in the house\'s day style, without the year', () => {
    // 3 April 2028 is a Monday (ISO 8601 calendar)
    expect(rulerDayLabel('2028-04-03', 'en-GB')).toBe('Mon 3 Apr')
    expect(rulerDayLabel('2028-04-03', 'en-US')).toBe('Mon, Apr 3')
    expect(rulerDayLabel('2028-04-03', null)).toBe('Mon 3 Apr')
  })
})
