// The planner on a real shop's week: profiles with several identical moulds, mould work with an
// "available from" date, casters' hours and absences, shop closures, honest finish dates.
// Example tests check values worked by hand from the rules in shared/utils/planner.ts' header;
// property tests check invariants on random scenarios (fast-check, fixed seed).
import { describe, it, expect } from 'vitest'
import fc from 'fast-check'
import { planPours } from '#shared/utils/planner'
import type { PlanPoursInput, PlannerItem, PlannerMould } from '#shared/types/planner'
import { baseInput, expectInsideShifts, expectNoOverlaps, item, mould } from './planner-helpers'

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
