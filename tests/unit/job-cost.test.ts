import { describe, it, expect } from 'vitest'
import { jobCost, jobCostCastingShares, jobCostFinishingTimes, jobCostPourPlaster, type JobCostInput } from '#shared/utils/job-cost'

const at = (hhmm: string) => new Date(`2026-12-07T${hhmm}:00Z`)

/**
 * Our own worked example, priced by hand here (no published source: the arithmetic is ours).
 * Labour £24.00 an hour (2400 p). Two items: A (estimate £50.00) and B (no estimate).
 *
 * Plaster: P1 (A) 10 kg of a 25 kg bag at £18.50 → 10 / 25 × 1850 = 740 p; P2 (B) 7.3 kg →
 * 7.3 × 1850 / 25 = 540.2 → 540 p; P3 (A) 5 kg from a lot without a price → unpriced.
 *
 * Casting, caster 10: P1 09:00–10:00, P2 09:30–10:30 and another job's pour X 10:15–10:45.
 * 09:00–09:30 P1 alone (30 min); 09:30–10:00 P1 and P2 (15 min each); 10:00–10:15 P2 alone
 * (15 min); 10:15–10:30 P2 and X (7.5 min each). P1 = 45 min → 0.75 h × 2400 = 1800 p (A);
 * P2 = 37.5 min → 0.625 h × 2400 = 1500 p (B). Caster 10 has 82.5 minutes on this job.
 *
 * Finishing: piece 100 (A) fettled by 20 from 11:00 to 11:20, then by 21 from 13:00 to 'fettled'
 * at 13:10: 30 min → 1200 p. Piece 102 (B) started by 20 at 14:00, taken over by 21 at 14:06,
 * fettled 14:10: 10 min → 400 p (20: 6 min, 21: 4 min). Piece 101 (B) repair started by 20 at
 * 11:00 and still running at 15:00: 4 h → 9600 p.
 *
 * Mould-making: 6.5 h by person 30 on a mould two items cast in (A and another job's item):
 * 6.5 × 2400 = 15600 p, half to A: 7800 p; 3.25 h on this job.
 *
 * A: 740 + 1800 + 1200 + 0 + 7800 = 11540 p, £65.40 over its £50.00 estimate.
 * B: 540 + 1500 + 400 + 9600 + 0 = 12040 p, no estimate.
 * Total 23580 p against the quote's £200.00 estimate: 3580 p over.
 */
const example: JobCostInput = {
  labourPerHourMinor: 2400,
  items: [{ id: 1, estimateMinor: 5000 }, { id: 2, estimateMinor: null }],
  pours: [
    { id: 1, itemId: 1, plasterKg: 10, bagKg: 25, pricePerBagMinor: 1850 },
    { id: 2, itemId: 2, plasterKg: 7.3, bagKg: 25, pricePerBagMinor: 1850 },
    { id: 3, itemId: 1, plasterKg: 5, bagKg: 25, pricePerBagMinor: null },
  ],
  casting: [
    { pourId: 1, itemId: 1, personId: 10, start: at('09:00'), end: at('10:00') },
    { pourId: 2, itemId: 2, personId: 10, start: at('09:30'), end: at('10:30') },
    { pourId: 99, itemId: null, personId: 10, start: at('10:15'), end: at('10:45') },
  ],
  finishing: [
    { pieceId: 100, itemId: 1, personId: 20, type: 'fettle_start', at: at('11:00') },
    { pieceId: 100, itemId: 1, personId: 20, type: 'fettle_stop', at: at('11:20') },
    { pieceId: 100, itemId: 1, personId: 21, type: 'fettle_start', at: at('13:00') },
    { pieceId: 100, itemId: 1, personId: 21, type: 'fettled', at: at('13:10') },
    { pieceId: 102, itemId: 2, personId: 20, type: 'fettle_start', at: at('14:00') },
    { pieceId: 102, itemId: 2, personId: 21, type: 'fettle_start', at: at('14:06') },
    { pieceId: 102, itemId: 2, personId: 21, type: 'fettled', at: at('14:10') },
    { pieceId: 101, itemId: 2, personId: 20, type: 'repair_start', at: at('11:00') },
  ],
  mouldWorks: [{ id: 1, personId: 30, hours: 6.5, itemIds: [1], sharedBy: 2 }],
  quoteEstimateMinor: 20000,
  now: at('15:00'),
}

describe('job cost: our own worked example, priced by hand', () => {
  it('prices each item by kind of cost and compares it with its estimate', () => {
    const r = jobCost(example)
    expect(r.items).toEqual([
      { itemId: 1, plaster: 740, casting: 1800, fettling: 1200, repair: 0, mouldMaking: 7800, total: 11540, estimate: 5000, difference: 6540 },
      { itemId: 2, plaster: 540, casting: 1500, fettling: 400, repair: 9600, mouldMaking: 0, total: 12040, estimate: null, difference: null },
    ])
    expect(r.total).toEqual({ plaster: 1280, casting: 3300, fettling: 1600, repair: 9600, mouldMaking: 7800, total: 23580, estimate: 20000, difference: 3580 })
    expect(r.unpricedPours).toBe(1)
    expect(r.running).toBe(1)
  })

  it('books the hours to who took them', () => {
    const people = Object.fromEntries(jobCost(example).people.map(p => [p.personId, p]))
    expect(people[10]).toMatchObject({ castingMinutes: 82.5, fettlingMinutes: 0 })
    expect(people[20]).toMatchObject({ fettlingMinutes: 26, repairMinutes: 240 })
    expect(people[21]).toMatchObject({ fettlingMinutes: 14 })
    expect(people[30]).toMatchObject({ mouldHours: 3.25 })
  })

  it('says there is no estimate for a job without an accepted quote', () => {
    const r = jobCost({ ...example, quoteEstimateMinor: null })
    expect(r.total.estimate).toBeNull()
    expect(r.total.difference).toBeNull()
    expect(r.total.total).toBe(23580)
  })
})

describe('job cost: the parts', () => {
  it('rounds a pour\'s plaster once, half away from zero', () => {
    // 12.5 kg of a 25 kg bag at 1851 p: 925.5 → 926 (our own example)
    expect(jobCostPourPlaster({ plasterKg: 12.5, bagKg: 25, pricePerBagMinor: 1851 })).toBe(926)
    expect(jobCostPourPlaster({ plasterKg: null, bagKg: 25, pricePerBagMinor: 1851 })).toBeNull()
  })

  it('shares a caster\'s moment equally between the pours open then, exactly', () => {
    // three pours over the same ten minutes: a third each, never thirty minutes of one person
    const spans = [1, 2, 3].map(pourId => ({ pourId, itemId: pourId, personId: 7, start: at('08:00'), end: at('08:10') }))
    const { denominator, shareMs } = jobCostCastingShares(spans)
    expect(denominator).toBe(3n)
    expect([...shareMs.values()]).toEqual([600_000n, 600_000n, 600_000n])
    // 10/3 min at 100 p an hour is 5.56 p each, 6 p after rounding; one item with all three: 16.67 → 17 p
    const separate = jobCost({ ...example, labourPerHourMinor: 100, items: [1, 2, 3].map(id => ({ id, estimateMinor: null })), pours: [], finishing: [], mouldWorks: [], casting: spans })
    expect(separate.items.map(i => i.casting)).toEqual([6, 6, 6])
    const together = jobCost({ ...example, labourPerHourMinor: 100, items: [{ id: 1, estimateMinor: null }], pours: [], finishing: [], mouldWorks: [], casting: spans.map(s => ({ ...s, itemId: 1 })) })
    expect(together.items[0]!.casting).toBe(17)
  })

  it('a different caster\'s pours do not share', () => {
    const spans = [
      { pourId: 1, itemId: 1, personId: 7, start: at('08:00'), end: at('09:00') },
      { pourId: 2, itemId: 1, personId: 8, start: at('08:00'), end: at('09:00') },
    ]
    expect([...jobCostCastingShares(spans).shareMs.values()]).toEqual([3_600_000n, 3_600_000n])
  })

  it('ends fettling when the piece is sent to repair', () => {
    const t = jobCostFinishingTimes([
      { pieceId: 1, itemId: 1, personId: 5, type: 'fettle_start', at: at('08:00') },
      { pieceId: 1, itemId: 1, personId: 5, type: 'repair', at: at('08:05') },
    ], at('12:00'))
    expect(t.map(x => [x.kind, Number(x.ms) / 60_000, x.running])).toEqual([['fettling', 5, false]])
  })

  it('ends a repair at repaired and both timers at rejected; a stop without a start adds nothing', () => {
    const t = jobCostFinishingTimes([
      { pieceId: 1, itemId: 1, personId: 5, type: 'repair_stop', at: at('07:00') },
      { pieceId: 1, itemId: 1, personId: 5, type: 'repair_start', at: at('08:00') },
      { pieceId: 1, itemId: 1, personId: 5, type: 'repaired', at: at('08:30') },
      { pieceId: 1, itemId: 1, personId: 5, type: 'fettle_start', at: at('09:00') },
      { pieceId: 1, itemId: 1, personId: 5, type: 'rejected', at: at('09:12') },
    ], at('12:00'))
    expect(t.map(x => [x.kind, Number(x.ms) / 60_000, x.running])).toEqual([['fettling', 12, false], ['repair', 30, false]])
  })
})
