import { describe, it, expect } from 'vitest'
import { GRADE_PRESETS, PlasterInputError } from '#shared/utils/plaster'
import {
  POUR_MIX_MINUTES_DEFAULT,
  dwellWarning,
  pourTiming,
  pourTimingFromSlotStart,
  pourTimingMinutes,
} from '#shared/utils/pour-timing'
import { inputErrorField } from '../setup/input-errors'

// Preset values relied on (plaster-presets.ts): beta casting demouldMinutesRef 30 at its default
// consistency 70, set-time water exponent 1.2, temperature factor 1 at 20 °C and 1.3 at 10 °C.
// 30 min at 70 and 20 °C sits inside the 20–45 min that is common practice (no published source).
const beta = GRADE_PRESETS['beta-casting']
const mould = { prepMinutes: 10, cleanMinutes: 15, maxDwellMinutes: 120 }
const mixAt = new Date('2026-12-07T09:00:00Z')
const min = (n: number) => n * 60_000
const at = (base: Date, minutes: number) => new Date(base.getTime() + min(minutes))

const fieldOf = (fn: () => unknown) => inputErrorField(fn, PlasterInputError)

describe('pourTiming', () => {
  it('beta casting at 70 and 20 °C opens 30 min after mixing ends (preset), so 35 min after mixAt', () => {
    expect(POUR_MIX_MINUTES_DEFAULT).toBe(5)
    const t = pourTiming({ mixAt, mould, grade: beta, consistency: 70, slurryTempC: 20, setFactor: 1 })
    expect(t.slotStart).toEqual(at(mixAt, -10)) // prep
    expect(t.mixAt).toEqual(mixAt)
    expect(t.demouldOpenAt).toEqual(at(mixAt, 5 + 30))
    expect(t.demouldCloseAt).toEqual(at(mixAt, 5 + 30 + 120)) // + the mould's max dwell
    expect(t.slotEnd).toEqual(at(mixAt, 5 + 30 + 15)) // + clean
    expect(t.warnings).toEqual([])
  })

  it('rounds a fractional demould time up to the next minute', () => {
    // By hand: 30 × (80 / 70)^1.2 = 35.21 min after mixing ends, + 5 min mixing = 40.21 → 41.
    const t = pourTiming({ mixAt, mould, grade: beta, consistency: 80, slurryTempC: 20, setFactor: 1 })
    expect(t.demouldOpenAt).toEqual(at(mixAt, 41))
    expect(t.demouldCloseAt).toEqual(at(mixAt, 41 + 120))
  })

  it('follows the slurry temperature, the set factor and the mixing minutes', () => {
    // By hand: 30 × 1.3 (10 °C) = 39 min, + 5 → 44; with setFactor 0.5: 15 + 3 (pourMinutes) → 18.
    expect(pourTiming({ mixAt, mould, grade: beta, consistency: 70, slurryTempC: 10, setFactor: 1 }).demouldOpenAt).toEqual(at(mixAt, 44))
    expect(pourTiming({ mixAt, mould, grade: beta, consistency: 70, slurryTempC: 20, setFactor: 0.5, pourMinutes: 3 }).demouldOpenAt).toEqual(at(mixAt, 18))
  })

  it('passes the plaster model\'s warnings through', () => {
    const t = pourTiming({ mixAt, mould, grade: beta, consistency: 70, slurryTempC: 3, setFactor: 1 })
    expect(t.warnings.some(w => w.includes('below 5 °C'))).toBe(true)
  })

  it('from a prep start gives the same pour as from its mixAt', () => {
    const set = { mould, grade: beta, consistency: 75, slurryTempC: 14, setFactor: 1.1 }
    const fromSlot = pourTimingFromSlotStart({ ...set, slotStart: at(mixAt, -10) })
    expect(fromSlot).toEqual(pourTiming({ ...set, mixAt }))
  })

  it('names the bad field', () => {
    const ok = { mixAt, mould, grade: beta, consistency: 70, slurryTempC: 20, setFactor: 1 }
    expect(fieldOf(() => pourTiming({ ...ok, mixAt: new Date('x') }))).toBe('mixAt')
    expect(fieldOf(() => pourTiming({ ...ok, mould: { ...mould, prepMinutes: -1 } }))).toBe('mould.prepMinutes')
    expect(fieldOf(() => pourTiming({ ...ok, mould: { ...mould, maxDwellMinutes: Number.NaN } }))).toBe('mould.maxDwellMinutes')
    expect(fieldOf(() => pourTiming({ ...ok, consistency: 10 }))).toBe('consistency')
    expect(fieldOf(() => pourTiming({ ...ok, pourMinutes: -5 }))).toBe('pourMinutes')
    expect(fieldOf(() => pourTimingFromSlotStart({ ...ok, slotStart: new Date(Number.NaN) }))).toBe('slotStart')
  })

  it('gives whole-minute offsets', () => {
    const m = pourTimingMinutes({ mould, grade: beta, consistency: 66.6, slurryTempC: 17.3 })
    for (const v of [m.prepMinutes, m.openAfterMix, m.closeAfterMix, m.cleanMinutes]) expect(Number.isInteger(v)).toBe(true)
  })
})

describe('dwellWarning', () => {
  const shiftEndAt = new Date('2026-12-07T16:00:00Z')
  const nextShiftStartAt = new Date('2026-12-08T07:30:00Z')

  it('is quiet when the window opens by the shift end', () => {
    expect(dwellWarning({ demouldOpenAt: shiftEndAt, demouldCloseAt: at(shiftEndAt, 30), shiftEndAt, nextShiftStartAt })).toBeNull()
  })

  it('is quiet when the mould holds the cast until the next shift starts (close ≥ next start)', () => {
    const open = at(shiftEndAt, 10)
    expect(dwellWarning({ demouldOpenAt: open, demouldCloseAt: nextShiftStartAt, shiftEndAt, nextShiftStartAt })).toBeNull()
    expect(dwellWarning({ demouldOpenAt: open, demouldCloseAt: at(nextShiftStartAt, 60), shiftEndAt, nextShiftStartAt })).toBeNull()
  })

  it('warns when the window opens after the shift and closes before the next starts', () => {
    const w = dwellWarning({ demouldOpenAt: at(shiftEndAt, 10), demouldCloseAt: at(shiftEndAt, 130), shiftEndAt, nextShiftStartAt })
    expect(w).toMatch(/cannot hold the cast overnight/)
    expect(w).toMatch(/800 min before/) // 18:10 to 07:30 next day
  })

  it('names a bad date', () => {
    expect(fieldOf(() => dwellWarning({ demouldOpenAt: new Date('x'), demouldCloseAt: shiftEndAt, shiftEndAt, nextShiftStartAt }))).toBe('demouldOpenAt')
  })
})
