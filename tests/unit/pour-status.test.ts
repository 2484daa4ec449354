import { describe, expect, it } from 'vitest'
import { MISSED_START_GRACE_MINUTES, POUR_SITUATION_WORDS, demouldTiming, pourSituation, pourWindowFromSteps } from '#shared/utils/pour-status'

// Check values are worked by hand from the rules in the file's header (our rules, no outside source).
const base = Date.parse('2027-03-01T10:15:00Z')
const min = (n: number) => base + n * 60_000
const iso = (n: number) => new Date(min(n)).toISOString()
const pour = { mixAt: iso(0), demouldOpenAt: iso(45), demouldCloseAt: iso(165) }

describe('pourSituation', () => {
  it('tells a planned pour waiting, due now, then a missed start after the grace', () => {
    expect(pourSituation({ ...pour, state: 'planned' }, min(-1))).toBe('waiting')
    expect(pourSituation({ ...pour, state: 'planned' }, min(0))).toBe('mix_now')
    expect(pourSituation({ ...pour, state: 'planned' }, min(MISSED_START_GRACE_MINUTES))).toBe('mix_now')
    expect(pourSituation({ ...pour, state: 'planned' }, min(MISSED_START_GRACE_MINUTES) + 1)).toBe('missed_start')
    // seven hours on, a never-mixed pour is still a missed start, never an overdue demould
    expect(pourSituation({ ...pour, state: 'planned' }, min(420))).toBe('missed_start')
  })
  it('tells a cast in the mould setting, ready, then an overdue demould once the window closed', () => {
    expect(pourSituation({ ...pour, state: 'setting' }, min(44))).toBe('setting')
    expect(pourSituation({ ...pour, state: 'mixing' }, min(10))).toBe('mixing')
    expect(pourSituation({ ...pour, state: 'setting' }, min(45))).toBe('ready')
    expect(pourSituation({ ...pour, state: 'setting' }, min(165))).toBe('ready')
    expect(pourSituation({ ...pour, state: 'setting' }, min(165) + 1)).toBe('overdue_demould')
    expect(pourSituation({ ...pour, state: 'demoulded' }, min(900))).toBe('demoulded')
    expect(POUR_SITUATION_WORDS.missed_start).not.toBe(POUR_SITUATION_WORDS.overdue_demould)
  })
})

describe('demouldTiming', () => {
  it('is early before the window, in the window at its ends, late after it', () => {
    expect(demouldTiming(pour, min(5))).toBe('early')
    expect(demouldTiming(pour, min(45))).toBe('in_window')
    expect(demouldTiming(pour, min(165))).toBe('in_window')
    expect(demouldTiming(pour, min(166))).toBe('late')
  })
})

describe('pourWindowFromSteps', () => {
  it('moves the window by the real start of mixing taken on the device', () => {
    const moved = pourWindowFromSteps({ ...pour, state: 'planned' }, [{ kind: 'start_mixing', at: iso(95) }, { kind: 'poured', at: iso(100) }])
    expect(moved).toMatchObject({ mixAt: iso(95), demouldOpenAt: iso(140), demouldCloseAt: iso(260) })
  })
  it('leaves the window alone with no step taken or once the server has the start', () => {
    expect(pourWindowFromSteps({ ...pour, state: 'planned' }, [])).toMatchObject(pour)
    expect(pourWindowFromSteps({ ...pour, state: 'mixing' }, [{ kind: 'poured', at: iso(95) }])).toMatchObject(pour)
  })
})
