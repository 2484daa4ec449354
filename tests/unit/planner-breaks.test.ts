// Shift breaks: the calendar carries each working day's breaks as instants in the workshop's
// zone, and the planner gauges no mix into one. Timing as in planner.test.ts: the beta casting
// preset at 70 in a 20 °C shop, a mould with 10 min prep and 10 min clean, mix 5 min, window
// open 30 min after mixing ends: a 55-minute cycle from 07:30 (pour-timing.test.ts checks it).
// The expected slots below are that cycle worked by hand around the breaks.
import { describe, expect, it } from 'vitest'
import { planPours } from '#shared/utils/planner'
import { PlanningInputError, shiftWindows } from '#shared/utils/workshop-calendar'
import { shiftBreakSchema, workshopSettingsSchema } from '#shared/utils/workshop-schemas'
import { MIN, baseInput, expectInsideShifts, expectNoOverlaps, item, london } from './planner-helpers'

const hhmm = (d: Date) => d.toISOString().slice(11, 16)
const withBreaks = { ...london, breaks: [{ start: '10:27', end: '10:45' }, { start: '12:30', end: '13:00' }] }

describe('shift breaks', () => {
  it('puts each working day\'s breaks on its window, in local time across a clock change', () => {
    // London keeps GMT in December and BST (UTC+1) in June (Summer Time Order)
    const winter = shiftWindows({ ...withBreaks, from: new Date('2026-12-07T00:00:00Z'), to: new Date('2026-12-08T00:00:00Z') })
    expect(winter[0]!.breaks.map(b => [hhmm(b.start), hhmm(b.end)])).toEqual([['10:27', '10:45'], ['12:30', '13:00']])
    const summer = shiftWindows({ ...withBreaks, from: new Date('2026-06-01T00:00:00Z'), to: new Date('2026-06-02T00:00:00Z') })
    expect(summer[0]!.breaks.map(b => [hhmm(b.start), hhmm(b.end)])).toEqual([['09:27', '09:45'], ['11:30', '12:00']])
    expect(shiftWindows({ ...london, from: new Date('2026-12-07T00:00:00Z'), to: new Date('2026-12-08T00:00:00Z') })[0]!.breaks).toEqual([])
  })

  it('gauges no mix into a break: a mix that would start in one or run into one waits for its end', () => {
    const input = baseInput({ calendar: withBreaks, items: [item('1', { piecesRemaining: 12 })] })
    const result = planPours(input)
    expectNoOverlaps(input, result)
    expectInsideShifts(input, result)
    const monday = result.pours.filter(p => p.day === '2026-12-07')
    // 10:15 would mix 10:25–10:30, into the 10:27 break: prep from 10:35, mix at 10:45;
    // 12:25 would mix at 12:35, inside lunch: prep from 12:50, mix at 13:00
    expect(monday.slice(0, 7).map(p => [hhmm(p.slotStart), hhmm(p.mixAt)])).toEqual([
      ['07:30', '07:40'], ['08:25', '08:35'], ['09:20', '09:30'], ['10:35', '10:45'], ['11:30', '11:40'], ['12:50', '13:00'], ['13:45', '13:55'],
    ])
    const windows = shiftWindows({ ...withBreaks, from: input.from, to: new Date(input.to.getTime() + 30 * 86_400_000) })
    for (const p of result.pours) {
      const w = windows.find(x => x.day === p.day)!
      for (const b of w.breaks) {
        const touches = p.mixAt < b.end && b.start.getTime() < p.mixAt.getTime() + 5 * MIN
        expect(touches, `${p.day} mix at ${hhmm(p.mixAt)} runs into the break from ${hhmm(b.start)}`).toBe(false)
      }
    }
  })

  it('refuses a break outside the shift or ending before it starts, naming the break', () => {
    const field = (breaks: { start: string; end: string }[]) => {
      try {
        shiftWindows({ ...london, breaks, from: new Date('2026-12-07T00:00:00Z'), to: new Date('2026-12-08T00:00:00Z') })
      }
      catch (e) {
        expect(e).toBeInstanceOf(PlanningInputError)
        return (e as PlanningInputError).field
      }
      return undefined
    }
    expect(field([{ start: '06:00', end: '06:30' }])).toBe('shiftBreaks.0')
    expect(field([{ start: '10:00', end: '10:15' }, { start: '12:30', end: '12:00' }])).toBe('shiftBreaks.1')
    expect(field([{ start: '10:00', end: '10:15' }])).toBeUndefined()
  })

  it('checks breaks in the settings in the words of the form', () => {
    const settings = { version: 1, name: 'Example', units: 'metric', timezone: 'Europe/London', shiftStart: '07:30', shiftEnd: '16:00', workingDays: [1, 2, 3, 4, 5], defaultShopTempC: 18, defaultHumidityPct: 60 }
    expect(workshopSettingsSchema.parse(settings).shiftBreaks).toEqual([])
    const overlap = workshopSettingsSchema.safeParse({ ...settings, shiftBreaks: [{ start: '10:00', end: '10:30' }, { start: '10:15', end: '10:45' }] })
    expect(overlap.error?.issues.map(i => [i.path.join('.'), i.message])).toContainEqual(['shiftBreaks.0.start', 'Break 1 overlaps another break'])
    const outside = workshopSettingsSchema.safeParse({ ...settings, shiftBreaks: [{ start: '16:30', end: '17:00' }] })
    expect(outside.error?.issues[0]?.message).toBe('Break 1 must fall inside the shift, 07:30–16:00')
    expect(shiftBreakSchema.safeParse({ start: '25:00', end: '10:00' }).error?.issues[0]?.message).toBe('Break start must be a time as HH:MM')
  })
})
