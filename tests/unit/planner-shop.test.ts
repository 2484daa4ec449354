// The planner on a real shop's week: profiles with several identical moulds, mould work with an
// "available from" date, casters' hours and absences, shop closures, honest finish dates.
// Example tests check values worked by hand from the rules in shared/utils/planner.ts' header;
// property tests check invariants on random scenarios (fast-check, fixed seed).
import { describe, it, expect } from 'vitest'
import fc from 'fast-check'
import { planPours } from '#shared/utils/planner'
import { mouldWorkAvailableFrom } from '#shared/utils/mould-work'
import type { PlanPoursInput, PlannerItem, PlannerMould } from '#shared/types/planner'
import { MIN, baseInput, expectInsideShifts, expectNoOverlaps, item, mould } from './planner-helpers'

describe('profiles', () => {
  it('plans an item that names only a profile on the profile\'s moulds', () => {
    const input = baseInput({
      moulds: [mould('1', { profileId: 'p1' }), mould('2', { profileId: 'p1' }), mould('3', { profileId: 'p2' })],
      items: [item('i1', { mouldIds: [], profileId: 'p1', piecesRemaining: 4 })],
    })
    const result = planPours(input)
    expect(result.unplaced).toEqual([])
    expect(result.pours).toHaveLength(4)
    expect(new Set(result.pours.map(p => p.mouldId))).toEqual(new Set(['1', '2']))
  })

  it('spreads an item naming one mould over the other moulds of that mould\'s profile', () => {
    const one = planPours(baseInput({ moulds: [mould('1'), mould('2')], items: [item('i1', { piecesRemaining: 2 })] }))
    // without a shared profile only the named mould casts, one pour after the other
    expect(one.pours.map(p => p.mouldId)).toEqual(['1', '1'])
    const two = planPours(baseInput({
      moulds: [mould('1', { profileId: 'p1' }), mould('2', { profileId: 'p1' })],
      items: [item('i1', { piecesRemaining: 2 })],
    }))
    // two identical moulds: both pours start at the shift start (07:30 GMT on Monday 7 Dec)
    expect(two.pours.map(p => p.mouldId).sort()).toEqual(['1', '2'])
    expect(two.pours.map(p => p.slotStart.toISOString())).toEqual(['2026-12-07T07:30:00.000Z', '2026-12-07T07:30:00.000Z'])
  })

  it('never uses a profile\'s mould in repair, and says so when the profile has none left', () => {
    const result = planPours(baseInput({
      moulds: [mould('1', { profileId: 'p1', state: 'repair' }), mould('2', { profileId: 'p1', state: 'retired' })],
      items: [item('i1', { mouldIds: [], profileId: 'p1', piecesRemaining: 3 })],
    }))
    expect(result.pours).toEqual([])
    expect(result.unplaced).toMatchObject([{ itemId: 'i1', reason: 'no-usable-mould', pieces: 3 }])
    expect(result.unplaced[0]!.message).toMatch(/profile/)
  })
})

const profileShopArb: fc.Arbitrary<PlanPoursInput> = fc.record({
  profiles: fc.array(fc.constantFrom('p1', 'p2', 'p3', null), { minLength: 1, maxLength: 6 }),
  states: fc.array(fc.constantFrom('ready', 'ready', 'in_use', 'repair', 'retired'), { minLength: 6, maxLength: 6 }),
  items: fc.array(fc.record({
    profile: fc.constantFrom('p1', 'p2', 'p3', null),
    mould: fc.option(fc.integer({ min: 1, max: 6 })),
    pieces: fc.integer({ min: 0, max: 6 }),
    job: fc.integer({ min: 1, max: 3 }),
  }), { minLength: 1, maxLength: 5 }),
  casters: fc.boolean(),
}).map(({ profiles, states, items, casters }) => {
  const moulds: PlannerMould[] = profiles.map((p, i) => mould(String(i + 1), { profileId: p, state: states[i] as PlannerMould['state'] }))
  const planned: PlannerItem[] = items.map((it, i) => item(`i${i + 1}`, {
    jobId: `j${it.job}`, jobCode: `J-${it.job}`, piecesRemaining: it.pieces, profileId: it.profile,
    mouldIds: it.mould !== null && it.mould <= moulds.length ? [String(it.mould)] : [],
  }))
  return baseInput({ moulds, items: planned, options: { projectionDays: 10, ...(casters ? { casters: ['c1'] } : {}) } })
})

describe('profiles: properties', () => {
  it('no overlaps, one mould per pour, and every pour on the item\'s mould or a mould of its profile', () => {
    fc.assert(fc.property(profileShopArb, (input) => {
      const result = planPours(input)
      expectNoOverlaps(input, result)
      expectInsideShifts(input, result)
      const moulds = new Map(input.moulds.map(m => [m.id, m]))
      const items = new Map(input.items.map(i => [i.itemId, i]))
      for (const p of result.pours) {
        const m = moulds.get(p.mouldId)
        const it = items.get(p.itemId)!
        expect(m, 'one known mould per pour').toBeDefined()
        expect(['repair', 'retired']).not.toContain(m!.state)
        const namedProfiles = it.mouldIds.map(id => moulds.get(id)?.profileId).filter(Boolean)
        const allowed = it.mouldIds.includes(p.mouldId) || (m!.profileId != null && (m!.profileId === it.profileId || namedProfiles.includes(m!.profileId)))
        expect(allowed, `pour of ${p.itemId} on mould ${p.mouldId}`).toBe(true)
      }
      // an item with a usable mould of its own or of its profile is never refused for want of one
      for (const it of input.items) {
        if (it.piecesRemaining === 0) continue
        const namedProfiles = it.mouldIds.map(id => moulds.get(id)?.profileId).filter(Boolean)
        const usable = input.moulds.some(m => !['repair', 'retired'].includes(m.state)
          && (it.mouldIds.includes(m.id) || (m.profileId != null && (m.profileId === it.profileId || namedProfiles.includes(m.profileId)))))
        const refused = result.unplaced.some(u => u.itemId === it.itemId && u.reason === 'no-usable-mould')
        expect(refused, `item ${it.itemId}`).toBe(!usable)
      }
    }))
  })
})

describe('calendars and people', () => {
  it('plans nothing on a shop closure: a holiday Monday moves the pour to Tuesday', () => {
    const result = planPours(baseInput({ items: [item('i1')], closures: [{ fromDay: '2026-12-07', toDay: '2026-12-07' }] }))
    expect(result.pours.map(p => p.day)).toEqual(['2026-12-08'])
  })

  it('books a caster only inside their own hours and never on an absence', () => {
    const result = planPours(baseInput({
      moulds: [mould('1'), mould('2')],
      items: [item('i1', { piecesRemaining: 2, mouldIds: ['1', '2'] })],
      options: {
        casters: ['c1', 'c2'],
        casterCalendars: {
          // c1 is away Monday; c2 starts at 10:00 (GMT in December)
          c1: { absences: [{ fromDay: '2026-12-07', toDay: '2026-12-07' }] },
          c2: { shiftStart: '10:00' },
        },
      },
    }))
    expect(result.pours.map(p => [p.casterId, p.day])).toEqual([['c2', '2026-12-07'], ['c2', '2026-12-07']])
    for (const p of result.pours) expect(p.mixAt.getTime()).toBeGreaterThanOrEqual(Date.parse('2026-12-07T10:00:00Z'))
  })

  it('lets a caster gauge two mixes at once only when they may', () => {
    const input = (maxMixes: number) => baseInput({
      moulds: [mould('1'), mould('2')],
      items: [item('i1', { piecesRemaining: 2, mouldIds: ['1', '2'] })],
      options: { casters: ['c1'], casterCalendars: { c1: { maxMixes } } },
    })
    const one = planPours(input(1)).pours.map(p => p.mixAt.getTime())
    const two = planPours(input(2)).pours.map(p => p.mixAt.getTime())
    // prep 10 min from 07:30; one caster, one mix at a time: the second mix waits the 5-minute gauging
    expect(one[1]! - one[0]!).toBe(5 * MIN)
    expect(two[1]).toBe(two[0])
  })

  it('keeps a bench to its mixes at once', () => {
    const result = planPours(baseInput({
      moulds: [mould('1', { benchId: 'b1' }), mould('2', { benchId: 'b1' })],
      items: [item('i1', { piecesRemaining: 2, mouldIds: ['1', '2'] })],
      options: { benchMaxMixes: { b1: 1 } },
    }))
    const [a, b] = result.pours.map(p => p.mixAt.getTime())
    expect(b! - a!).toBe(5 * MIN)
  })

  it('says in words when no caster can cast the pieces', () => {
    const result = planPours(baseInput({
      items: [item('i1', { piecesRemaining: 2 })],
      options: { casters: ['c1'], projectionDays: 3, casterCalendars: { c1: { absences: [{ fromDay: '2026-12-01', toDay: '2027-01-31' }] } } },
    }))
    expect(result.pours).toEqual([])
    expect(result.unplaced).toMatchObject([{ itemId: 'i1', reason: 'no-caster', pieces: 2 }])
    expect(result.unplaced[0]!.message).toMatch(/No caster is at work/)
  })

  it('skips a day below 0 °C and cautions on a day from 0 to 5 °C', () => {
    const result = planPours(baseInput({
      items: [item('i1', { piecesRemaining: 1 }), item('i2', { piecesRemaining: 1, jobId: 'j2', jobCode: 'J-002', mouldIds: ['2'] })],
      moulds: [mould('1'), mould('2')],
      shopTempByDay: { '2026-12-07': -1, '2026-12-08': 3 },
    }))
    expect(result.pours.map(p => p.day)).toEqual(['2026-12-08', '2026-12-08'])
    for (const p of result.pours) expect(p.warnings.join(' ')).toMatch(/cold day \(3 °C/)
  })
})

const absenceArb = fc.record({ from: fc.integer({ min: 0, max: 8 }), len: fc.integer({ min: 0, max: 3 }) })
  .map(({ from, len }) => {
    const d = (n: number) => new Date(Date.UTC(2026, 11, 7 + n)).toISOString().slice(0, 10)
    return { fromDay: d(from), toDay: d(from + len) }
  })

const peopleShopArb = fc.record({
  casters: fc.array(fc.record({
    start: fc.integer({ min: 7 * 60 + 30, max: 12 * 60 }),
    length: fc.integer({ min: 60, max: 8 * 60 }),
    days: fc.uniqueArray(fc.integer({ min: 1, max: 7 }), { minLength: 1, maxLength: 7 }),
    absences: fc.array(absenceArb, { maxLength: 2 }),
    maxMixes: fc.integer({ min: 1, max: 2 }),
  }), { minLength: 1, maxLength: 3 }),
  closures: fc.array(absenceArb, { maxLength: 2 }),
  pieces: fc.array(fc.integer({ min: 0, max: 8 }), { minLength: 1, maxLength: 4 }),
  moulds: fc.integer({ min: 1, max: 4 }),
}).map(({ casters, closures, pieces, moulds }) => {
  const clock = (m: number) => `${String(Math.floor(m / 60)).padStart(2, '0')}:${String(m % 60).padStart(2, '0')}`
  const ids = Array.from({ length: moulds }, (_, i) => String(i + 1))
  const casterCalendars = Object.fromEntries(casters.map((c, i) => [`c${i + 1}`, {
    shiftStart: clock(c.start), shiftEnd: clock(Math.min(c.start + c.length, 23 * 60 + 59)), workingDays: c.days, absences: c.absences, maxMixes: c.maxMixes,
  }]))
  return baseInput({
    moulds: ids.map(id => mould(id, { profileId: 'p' })),
    items: pieces.map((n, i) => item(`i${i + 1}`, { piecesRemaining: n, mouldIds: [], profileId: 'p' })),
    closures,
    options: { casters: Object.keys(casterCalendars), casterCalendars, projectionDays: 6 },
  })
})

describe('calendars and people: properties', () => {
  it('every pour has a caster at work for its whole mix, on no absence or closure, within their mixes at once', () => {
    fc.assert(fc.property(peopleShopArb, (input) => {
      const result = planPours(input)
      expectNoOverlaps(input, result)
      expectInsideShifts(input, result)
      const cals = input.options!.casterCalendars!
      const mixes = new Map<string, number[]>()
      for (const p of result.pours) {
        expect(p.casterId).not.toBeNull()
        const c = cals[p.casterId!]!
        expect(c.absences!.some(a => p.day >= a.fromDay && p.day <= a.toDay), `${p.casterId} absent on ${p.day}`).toBe(false)
        expect(input.closures!.some(a => p.day >= a.fromDay && p.day <= a.toDay), `closed on ${p.day}`).toBe(false)
        const weekday = new Date(`${p.day}T12:00:00Z`).getUTCDay() || 7
        expect(c.workingDays).toContain(weekday)
        // London in December is GMT: the caster's local hours are UTC hours
        const [sh, sm] = c.shiftStart!.split(':').map(Number)
        const [eh, em] = c.shiftEnd!.split(':').map(Number)
        const dayStart = Date.parse(`${p.day}T00:00:00Z`)
        expect(p.mixAt.getTime()).toBeGreaterThanOrEqual(dayStart + (sh! * 60 + sm!) * MIN)
        expect(p.mixAt.getTime() + 5 * MIN).toBeLessThanOrEqual(dayStart + (eh! * 60 + em!) * MIN)
        mixes.set(p.casterId!, [...(mixes.get(p.casterId!) ?? []), p.mixAt.getTime()])
      }
      for (const [id, list] of mixes) {
        for (const t of list) {
          const atOnce = list.filter(u => u < t + 5 * MIN && t < u + 5 * MIN).length
          expect(atOnce, `${id} mixes at once`).toBeLessThanOrEqual(cals[id]!.maxMixes!)
        }
      }
      // pieces left out for want of a caster are said so in words
      for (const u of result.unplaced) if (u.reason === 'no-caster') expect(u.message).toMatch(/caster/)
    }))
  })
})

describe('mould work', () => {
  it('never casts in a mould before its available-from date, and the job\'s date waits for it', () => {
    const availableFrom = new Date('2026-12-10T00:00:00Z')
    const result = planPours(baseInput({
      moulds: [mould('1', { availableFrom })],
      items: [item('i1', { piecesRemaining: 2 })],
    }))
    expect(result.pours.map(p => p.day)).toEqual(['2026-12-10', '2026-12-10'])
    const job = result.jobs[0]!
    expect(job.projectedDate).toBe('2026-12-10')
    expect(job.waitsFor).toEqual({ mouldCode: 'M1', availableOn: '2026-12-10' })
  })

  it('plans a mould in repair from its return date, and not at all without one', () => {
    const back = planPours(baseInput({ moulds: [mould('1', { state: 'repair', availableFrom: new Date('2026-12-09T00:00:00Z') })], items: [item('i1')] }))
    expect(back.pours.map(p => p.day)).toEqual(['2026-12-09'])
    const away = planPours(baseInput({ moulds: [mould('1', { state: 'repair' })], items: [item('i1')] }))
    expect(away.pours).toEqual([])
  })

  it('takes a ready mould of the profile rather than wait for a new one', () => {
    const result = planPours(baseInput({
      moulds: [mould('1', { profileId: 'p', availableFrom: new Date('2026-12-11T00:00:00Z') }), mould('2', { profileId: 'p' })],
      items: [item('i1', { mouldIds: [], profileId: 'p', piecesRemaining: 2 })],
    }))
    expect(result.pours.every(p => p.mouldId === '2' && p.day === '2026-12-07')).toBe(true)
    expect(result.jobs[0]!.waitsFor).toBeNull()
  })
})

describe('honest finish dates', () => {
  it('dates the job when its last piece is ready to dispatch, not when it leaves the mould', () => {
    const input = (readyHours?: number | null) => baseInput({ items: [item('i1', { piecesRemaining: 1, ...(readyHours === undefined ? {} : { readyHours }) })] })
    const bare = planPours(input())
    // Monday 7 Dec: prep from 07:30 GMT; the demould is the same day
    expect(bare.jobs[0]!.projectedDate).toBe('2026-12-07')
    const demouldAt = bare.jobs[0]!.readyAt!.getTime()
    // fettling 2 h + drying 70 h (a figure for the test): 72 h after the demould is Thursday 10 Dec
    const dried = planPours(input(72))
    expect(dried.jobs[0]!.readyAt!.getTime()).toBe(demouldAt + 72 * 3_600_000)
    expect(dried.jobs[0]!.projectedDate).toBe('2026-12-10')
    expect(dried.jobs[0]!.finishesOn).toBe('2026-12-10')
    // a due date before the pieces are dry is late, even though the cast is out on Monday
    const late = planPours(baseInput({ items: [item('i1', { dueOn: '2026-12-08', readyHours: 72 })] }))
    expect(late.jobs[0]!.onTime).toBe(false)
  })

  it('counts the fettling hours in the shop\'s shift time, the drying round the clock', () => {
    const bare = planPours(baseInput({ items: [item('i1', { piecesRemaining: 1 })] }))
    const demouldAt = bare.jobs[0]!.readyAt!.getTime()
    // our own check: the fettling fits the shift after a morning demould, so 2 h of it plus 70 h
    // of drying is 72 h as before; 8.5 h of fettling (a whole shift) ends at the same clock the
    // next working day, 24 h on, then the 70 h of drying
    const twoHours = planPours(baseInput({ items: [item('i1', { piecesRemaining: 1, readyHours: 72, fettleShiftHours: 2 })] }))
    expect(twoHours.jobs[0]!.readyAt!.getTime()).toBe(demouldAt + 72 * 3_600_000)
    const shift = planPours(baseInput({ items: [item('i1', { piecesRemaining: 1, readyHours: 78.5, fettleShiftHours: 8.5 })] }))
    expect(shift.jobs[0]!.readyAt!.getTime()).toBe(demouldAt + (24 + 70) * 3_600_000)
  })

  it('gives no date when the drying room would never dry the casts, and says why', () => {
    const result = planPours(baseInput({ items: [item('i1', { readyHours: null })] }))
    expect(result.jobs[0]!.projectedDate).toBeNull()
    expect(result.jobs[0]!.note).toMatch(/will not dry/)
  })

  it('reads the local day of the ready time in the workshop\'s zone', () => {
    // New York, 07:30 EST = 12:30 UTC; ready 12 h after a demould late in the morning is past midnight UTC but the same local evening
    const ny = { timezone: 'America/New_York', shiftStart: '07:30', shiftEnd: '16:00', workingDays: [1, 2, 3, 4, 5] }
    const result = planPours(baseInput({ calendar: ny, items: [item('i1', { readyHours: 12 })] }))
    const readyAt = result.jobs[0]!.readyAt!
    expect(readyAt.toISOString().slice(0, 10)).toBe('2026-12-08')
    expect(result.jobs[0]!.projectedDate).toBe('2026-12-07')
  })
})

describe('mould work and finish dates: properties', () => {
  it('no pour before its mould\'s available-from date; every job ready no earlier than its last demould', () => {
    fc.assert(fc.property(fc.record({
      avail: fc.array(fc.option(fc.integer({ min: 0, max: 12 })), { minLength: 1, maxLength: 4 }),
      repair: fc.array(fc.boolean(), { minLength: 4, maxLength: 4 }),
      pieces: fc.array(fc.integer({ min: 0, max: 5 }), { minLength: 1, maxLength: 4 }),
      readyHours: fc.integer({ min: 0, max: 200 }),
    }), ({ avail, repair, pieces, readyHours }) => {
      const moulds = avail.map((a, i) => mould(String(i + 1), {
        profileId: 'p', state: repair[i] ? 'repair' : 'ready', availableFrom: a === null ? null : new Date(Date.UTC(2026, 11, 7 + a)),
      }))
      const input = baseInput({ moulds, items: pieces.map((n, i) => item(`i${i + 1}`, { jobId: `j${i}`, jobCode: `J-${i}`, mouldIds: [], profileId: 'p', piecesRemaining: n, readyHours })), options: { projectionDays: 20 } })
      const result = planPours(input)
      expectNoOverlaps(input, result)
      const byId = new Map(moulds.map(m => [m.id, m]))
      for (const p of result.pours) {
        const m = byId.get(p.mouldId)!
        if (m.availableFrom) expect(p.slotStart.getTime()).toBeGreaterThanOrEqual(m.availableFrom.getTime())
        else expect(m.state).not.toBe('repair')
      }
      for (const j of result.jobs) {
        const mine = result.pours.filter(p => p.jobId === j.jobId)
        if (j.readyAt && mine.length) {
          const lastOut = Math.max(...mine.map(p => p.demouldOpenAt.getTime()))
          expect(j.readyAt.getTime()).toBeGreaterThanOrEqual(lastOut + readyHours * 3_600_000)
        }
      }
    }))
  })
})

describe('mould work: available-from day', () => {
  const stages = [
    { stage: 'model' as const, leadDays: 1, done: false },
    { stage: 'running' as const, leadDays: 3, done: false },
    { stage: 'case' as const, leadDays: 1, done: false },
  ]
  it('counts the stages\' lead days on working days and is ready the next working day', () => {
    // Mon 7 Dec + 5 working days (Mon–Fri) → ready Monday 14 Dec, worked by hand
    expect(mouldWorkAvailableFrom({ startedOn: '2026-12-07', stages, workingDays: [1, 2, 3, 4, 5] })).toBe('2026-12-14')
    // a closure on Wednesday 9 pushes the count a day: the fifth working day is Mon 14, ready Tue 15
    expect(mouldWorkAvailableFrom({ startedOn: '2026-12-07', stages, workingDays: [1, 2, 3, 4, 5], closedDays: ['2026-12-09'] })).toBe('2026-12-15')
    // stages done no longer count: only the case (1 day) is left, ready Tuesday 8
    expect(mouldWorkAvailableFrom({ startedOn: '2026-12-07', stages: stages.map((s, i) => ({ ...s, done: i < 2 })), workingDays: [1, 2, 3, 4, 5] })).toBe('2026-12-08')
  })
})
