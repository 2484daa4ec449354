import { describe, it, expect } from 'vitest'
import { apportion, quoteToJobItems } from '#shared/utils/quote-job'
import { priceQuote, takeOff, type TakeOffRoom, type WorkshopRates } from '#shared/utils/quote-pricing'

describe('splitting an integer total exactly', () => {
  it('gives the floors, then one more to the largest remainders (Hamilton\'s method)', () => {
    // 10 by 1:1:1 → 3.33 each: the first remainder in order gets the extra unit
    expect(apportion(10, [1, 1, 1])).toEqual([4, 3, 3])
    expect(apportion(5550, [27000, 14000, 14000])).toEqual([2724, 1413, 1413]) // 2724.545… | 1412.727… twice
    expect(apportion(7, [0, 0])).toEqual([7, 0])
    const parts = apportion(999_999_999_999, [3, 7, 11, 13])
    expect(parts.reduce((a, b) => a + b, 0)).toBe(999_999_999_999)
  })
})

describe('an accepted quote as job items: our own worked example', () => {
  // The quote of tests/unit/quote-pricing.test.ts (our own worked example, rates invented, priced
  // by hand there: estimate £1,373.75). Split by hand:
  //   run, Egg-and-dart 150 (3 lengths, 27 kg): cast 105.00 + new mould 420.00 + fettling 3/8 of
  //     72.00 = 27.00 + plaster 27/55 of 55.50 = 27.24545… → 27.24 → £579.24
  //   ceiling centre (1 piece, 14 kg): cast 28.00 + fettling 9.00 + plaster 14/55 of 55.50 =
  //     14.12727… → 14.13 → £51.13
  //   corbels (4 pieces, 14 kg): cast 112.00 + new mould 420.00 + fettling 36.00 + plaster 14.13 → £582.13
  //   plaster floors 27.24 + 14.12 + 14.12 leave 2p: the two largest remainders (0.727… each,
  //   against the run's 0.545…) get a penny each. Fixing 101.25 and delivery 60.00 stay with the
  //   whole job: £161.25. 579.24 + 51.13 + 582.13 + 161.25 = 1,373.75, the quote's estimate.
  const rooms: TakeOffRoom[] = [
    {
      name: 'Drawing room',
      runs: [{ profile: 'Egg-and-dart 150', walls: [{ lengthM: 5.0, end: 'internal' }, { lengthM: 3.1 }], castLengthM: 3, minPieceM: 0.3, sparesPct: 0, plasterKgPerLength: 9, newMould: true }],
      ornaments: [{ name: 'Ceiling centre 600', count: 1, plasterKgEach: 14, newMould: false }],
    },
    { name: 'Hall', runs: [], ornaments: [{ name: 'Corbel', count: 4, plasterKgEach: 3.5, newMould: true }] },
  ]
  const rates: WorkshopRates = {
    plasterPerBag: 1850, mouldPerProfile: 42000, castPerLength: 3500, castPerPiece: 2800, fettlePerPiece: 900,
    fixPerMetre: 1250, deliveryPerTrip: 6000, marginBp: 1500, taxBp: 2000,
  }

  it('makes a run item and a piece item per ornament, with the estimate of each', () => {
    const quote = priceQuote(takeOff(rooms, 25), rates, { deliveries: 1, fixing: true })
    const job = quoteToJobItems({ rooms, bagKg: 25 }, quote.lines)
    expect(job.items.map(i => [i.kind, i.description, i.pieces, i.quantity, i.estimateMinor])).toEqual([
      ['run', 'Egg-and-dart 150, Drawing room', 3, null, 57924],
      ['pieces', 'Ceiling centre 600, Drawing room', 1, 1, 5113],
      ['pieces', 'Corbel, Hall', 4, 4, 58213],
    ])
    // the run keeps its walls with their corners for the run calculator
    expect(job.items[0]!.walls).toEqual([{ lengthM: 5.0, end: 'internal' }, { lengthM: 3.1 }])
    expect(job.jobWideEstimate).toBe(16125)
    expect(job.items.reduce((a, i) => a + i.estimateMinor, 0) + job.jobWideEstimate).toBe(quote.estimate)
  })

  it('puts nothing of fixing or delivery on the items', () => {
    const without = priceQuote(takeOff(rooms, 25), rates, { deliveries: 0, fixing: false })
    const job = quoteToJobItems({ rooms, bagKg: 25 }, without.lines)
    expect(job.jobWideEstimate).toBe(0)
    expect(job.items.map(i => i.estimateMinor)).toEqual([57924, 5113, 58213])
  })

  it('shares the client\'s price out to the items the same way, adding up to the quote\'s net', () => {
    // Our own worked example, by hand: margin 15 % on each rate, rounded once (money.ts):
    //   cast per length 35.00 → 40.25; new mould 420.00 → 483.00; fettling 9.00 → 10.35;
    //   plaster per bag 18.50 → 21.275 → 21.28; cast per piece 28.00 → 32.20
    //   run: 3 × 40.25 = 120.75 + mould 483.00 + fettling 3/8 of 8 × 10.35 = 31.05
    //     + plaster 27/55 of 3 bags × 21.28 = 63.84 → 31.3396… → 31.34 → £666.14
    //   ceiling centre: 32.20 + 10.35 + 14/55 of 63.84 = 16.2501… → 16.25 → £58.80
    //   corbels: 4 × 32.20 = 128.80 + 483.00 + 41.40 + 16.25 → £669.45
    //   plaster floors 31.33 + 16.25 + 16.25 leave 1p: the run's remainder (0.96…) is the largest.
    //   Fixing 8.1 m × 14.38 (12.50 → 14.375 → 14.38) = 116.478 → 116.48, delivery 69.00: £185.48.
    const quote = priceQuote(takeOff(rooms, 25), rates, { deliveries: 1, fixing: true })
    const job = quoteToJobItems({ rooms, bagKg: 25 }, quote.lines)
    expect(job.items.map(i => i.priceMinor)).toEqual([66614, 5880, 66945])
    expect(job.jobWidePrice).toBe(18548)
    expect(job.items.reduce((a, i) => a + i.priceMinor, 0) + job.jobWidePrice).toBe(quote.net)
  })
})
