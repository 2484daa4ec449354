import { describe, expect, it } from 'vitest'
import { FETTLING_ALLOWANCE_HOURS, castReadyHours, jobCompletion, type CompletionCast } from '#shared/utils/client-completion'
import { finishingDryBy } from '#shared/utils/finishing'

// The drying hours come from finishingDryBy (Carrier's equation as in the ASHRAE Handbook,
// tested in plaster-drying.test.ts); these checks are about which cast sets the date.
const room = { tempC: 18, humidityPct: 60 }
const at = (h: number) => new Date(Date.UTC(2027, 4, 3, 8) + h * 3_600_000)
const cast = (over: Partial<CompletionCast> = {}): CompletionCast => ({
  pieceState: null, dryBy: null, demouldedAt: null, demouldOpenAt: at(0), wetMassKg: 4.4, dryMassKg: 3.4, cavityLitres: 2.5, ...over,
})

describe('jobCompletion', () => {
  it('gives no date while a piece is not planned, and says how many', () => {
    const r = jobCompletion({ items: [{ piecesNeeded: 18, planned: 8 }, { piecesNeeded: 2, planned: 3 }], casts: [cast()], room })
    expect(r).toEqual({ kind: 'not_planned', notPlanned: 10, ordered: 20 })
  })

  it('once all are planned, the last cast out plus fettling plus its drying estimate', () => {
    const r = jobCompletion({ items: [{ piecesNeeded: 2, planned: 2 }], casts: [cast(), cast({ demouldOpenAt: at(30) })], room })
    const last = finishingDryBy({ from: at(30 + FETTLING_ALLOWANCE_HOURS), wetMassKg: 4.4, dryMassKg: 3.4, cavityLitres: 2.5, airTempC: 18, relHumidityPct: 60 })
    expect(r).toEqual({ kind: 'ready_by', at: last.dryBy })
    // days of drying after the last demould, not the demould itself
    expect(last.dryBy!.getTime() - at(30).getTime()).toBeGreaterThan(24 * 3_600_000)
  })

  it('uses a piece\'s own dry-by, skips pieces already dry, and when all are dry says so', () => {
    const r = jobCompletion({ items: [{ piecesNeeded: 2, planned: 2 }], casts: [cast({ pieceState: 'drying', dryBy: at(500), demouldedAt: at(1) }), cast({ pieceState: 'ready', demouldedAt: at(900) })], room })
    expect(r).toEqual({ kind: 'ready_by', at: at(500) })
    expect(jobCompletion({ items: [{ piecesNeeded: 1, planned: 1 }], casts: [cast({ pieceState: 'packed' })], room })).toEqual({ kind: 'all_ready' })
  })

  it('stretches the drying by the shop\'s own falling-rate factor, as a piece put to dry gets it; fettling stays as it is', () => {
    const items = [{ piecesNeeded: 1, planned: 1 }]
    const base = jobCompletion({ items, casts: [cast()], room })
    const slow = jobCompletion({ items, casts: [cast()], room: { ...room, fallingRateFactor: 1.6 } })
    if (base.kind !== 'ready_by' || slow.kind !== 'ready_by') throw new Error('expected dates')
    // the drying hours after fettling scale by the factor (ready = demould + 2 h + drying × factor)
    const dryingHours = (d: Date) => (d.getTime() - at(0).getTime()) / 3_600_000 - FETTLING_ALLOWANCE_HOURS
    expect(dryingHours(slow.at)).toBeCloseTo(dryingHours(base.at) * 1.6, 6)
    const withFactor = finishingDryBy({ from: at(FETTLING_ALLOWANCE_HOURS), wetMassKg: 4.4, dryMassKg: 3.4, cavityLitres: 2.5, airTempC: 18, relHumidityPct: 60, fallingRateFactor: 1.6 })
    expect(slow.at).toEqual(withFactor.dryBy)
    expect(castReadyHours(cast(), { ...room, fallingRateFactor: 1.6 })).toBeCloseTo(FETTLING_ALLOWANCE_HOURS + dryingHours(base.at) * 1.6, 6)
  })

  it('counts fettling in the shift\'s hours when given the calendar: a cast out at 15:30 is fettled by 09:00 next morning', () => {
    const calendar = { timezone: 'UTC', shiftStart: '07:30', shiftEnd: '16:00', workingDays: [1, 2, 3, 4, 5] }
    const late = cast({ demouldOpenAt: new Date('2027-05-03T15:30:00Z') }) // a Monday
    const r = jobCompletion({ items: [{ piecesNeeded: 1, planned: 1 }], casts: [late], room, calendar })
    const dry = finishingDryBy({ from: new Date('2027-05-04T09:00:00Z'), wetMassKg: 4.4, dryMassKg: 3.4, cavityLitres: 2.5, airTempC: 18, relHumidityPct: 60 })
    expect(r).toEqual({ kind: 'ready_by', at: dry.dryBy })
    // round the clock without the calendar: 17:30 the same day, then the drying
    const plain = jobCompletion({ items: [{ piecesNeeded: 1, planned: 1 }], casts: [late], room })
    if (plain.kind !== 'ready_by') throw new Error('expected a date')
    expect(dry.dryBy!.getTime() - plain.at.getTime()).toBe(15.5 * 3_600_000)
    // a closure on the Tuesday moves it a day on
    const closed = jobCompletion({ items: [{ piecesNeeded: 1, planned: 1 }], casts: [late], room, calendar, closures: [{ fromDay: '2027-05-04', toDay: '2027-05-04' }] })
    if (closed.kind !== 'ready_by') throw new Error('expected a date')
    expect(closed.at.getTime() - dry.dryBy!.getTime()).toBe(24 * 3_600_000)
  })

  it('says it cannot tell in saturated air', () => {
    expect(jobCompletion({ items: [{ piecesNeeded: 1, planned: 1 }], casts: [cast()], room: { tempC: 18, humidityPct: 100 } })).toEqual({ kind: 'never_dries' })
  })
})
