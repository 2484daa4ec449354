import { describe, it, expect } from 'vitest'
import {
  PlasterInputError,
  bagsForKg,
  cToF,
  fToC,
  inToMm,
  kgToLb,
  lbToKg,
  litresToUsGallons,
  mmToIn,
  runCutList,
  usGallonsToLitres,
} from '#shared/utils/plaster'
import { inputErrorField } from '../setup/input-errors'

const fieldOf = (fn: () => unknown) => inputErrorField(fn, PlasterInputError)

function sumByWall(cuts: { wall: number; lengthM: number }[]): number[] {
  const sums: number[] = []
  for (const c of cuts) sums[c.wall] = (sums[c.wall] ?? 0) + c.lengthM
  return sums
}

describe('runCutList', () => {
  // Worked example: room 4.5 × 3.6 m with a chimney breast projecting 0.35 m, 3 m lengths;
  // run = 2 × (4.5 + 3.6) + 2 × 0.35 = 16.9 m
  const room = [4.5, 3.6, 4.5, 3.6, 0.35, 0.35].map(lengthM => ({ lengthM }))

  it('covers the worked example room (16.9 m) in 6 lengths plus a spare', () => {
    const r = runCutList({ walls: room, castLengthM: 3, minPieceM: 0.3, sparesPct: 10 })
    expect(r.usedLengths).toBe(6) // ceil(16.9 / 3) = 6: pooling offcuts meets the lower bound
    expect(r.spareLengths).toBe(1) // ceil(6 × 10 %) = 1 (spares rounded up)
    expect(r.lengths).toBe(7)
    expect(r.offcutM).toBeCloseTo(6 * 3 - 16.9, 9) // 1.1 m left over
    const sums = sumByWall(r.cuts)
    room.forEach((w, i) => expect(sums[i]).toBeCloseTo(w.lengthM, 9))
  })

  it('lists cuts wall by wall and packs longest first into the first length that holds them', () => {
    const r = runCutList({ walls: room, castLengthM: 3, minPieceM: 0.3, sparesPct: 0 })
    expect(r.cuts.map(c => c.wall)).toEqual([0, 0, 1, 1, 2, 2, 3, 3, 4, 5])
    // The four 3 m pieces take lengths 0–3; the two 1.5 m rests share length 4; the rest share length 5.
    expect(r.cuts.map(c => c.fromLength)).toEqual([0, 4, 1, 5, 2, 4, 3, 5, 5, 5])
  })

  it('balances a remainder shorter than minPieceM against the last full length', () => {
    // 6.2 m with 3 m lengths, min 0.5: 3 + 3 + 0.2 would leave a 0.2 m stub, so 3 + 1.6 + 1.6
    const r = runCutList({ walls: [{ lengthM: 6.2 }], castLengthM: 3, minPieceM: 0.5, sparesPct: 0 })
    expect(r.cuts.map(c => c.lengthM).sort((a, b) => a - b)).toEqual([1.6, 1.6, 3].map(x => expect.closeTo(x, 9)))
  })

  it('splits evenly when even balancing would leave a short piece', () => {
    // 8.7 m, 3 m lengths, min 2.9: 3 + 2.85 + 2.85 is too short, so three of 2.9 m
    const r = runCutList({ walls: [{ lengthM: 8.7 }], castLengthM: 3, minPieceM: 2.9, sparesPct: 0 })
    expect(r.cuts.map(c => c.lengthM)).toEqual([2.9, 2.9, 2.9].map(x => expect.closeTo(x, 9)))
  })

  it('rounds spares up', () => {
    const r = runCutList({ walls: [{ lengthM: 3 }], castLengthM: 3, minPieceM: 0, sparesPct: 5 })
    expect(r).toMatchObject({ usedLengths: 1, spareLengths: 1, lengths: 2 })
    expect(runCutList({ walls: [{ lengthM: 30 }], castLengthM: 3, minPieceM: 0, sparesPct: 10 }).spareLengths).toBe(1)
  })

  it('reuses an offcut before starting a new length: walls 5.0 and 3.1 m take 3 lengths, not 4', () => {
    // Worked example (issue 16, checked by hand): 3 m lengths, shortest piece 0.3 m, no spares.
    // Wall 1: 3.0 from length 0, 2.0 from length 1 (1.0 left); wall 2: the 1.0 offcut + 2.1 from
    // length 2. 3 lengths = ceil(8.1 / 3), the lower bound; splitting walls on their own needs 4.
    const r = runCutList({ walls: [{ lengthM: 5 }, { lengthM: 3.1 }], castLengthM: 3, minPieceM: 0.3, sparesPct: 0 })
    expect(r.usedLengths).toBe(3)
    expect(r.offcutM).toBeCloseTo(9 - 8.1, 9)
    expect(r.cuts.map(c => [c.wall, c.fromLength, c.lengthM])).toEqual([
      [0, 0, 3], [0, 1, 2], [1, 1, expect.closeTo(1, 9)], [1, 2, expect.closeTo(2.1, 9)],
    ])
  })

  it('adds the projection at each external mitre and return, and cuts the return piece', () => {
    // Derived by hand: a chimney breast 0.35 m deep between two internal corners, 0.12 m projection.
    // The breast's face (1.2 m) has two external corners: 1.2 + 2 × 0.12 = 1.44 m; each side
    // return (0.35 m) meets one internal and one external corner: 0.35 + 0.12 = 0.47 m.
    const walls = [
      { lengthM: 0.35, start: 'internal', end: 'external' },
      { lengthM: 1.2, start: 'external', end: 'external' },
      { lengthM: 0.35, start: 'external', end: 'internal' },
    ] as const
    const r = runCutList({ walls: [...walls], castLengthM: 3, minPieceM: 0.3, sparesPct: 0, projectionM: 0.12 })
    expect(r.runM.map(m => Math.round(m * 1000) / 1000)).toEqual([0.47, 1.44, 0.47])
    expect(r.usedLengths).toBe(1) // 2.38 m from one 3 m length
    // A run stopping on a free end returns to the wall: +0.12 m on the wall, a 0.12 m return piece
    const free = runCutList({ walls: [{ lengthM: 2, end: 'return' }], castLengthM: 3, minPieceM: 0.3, sparesPct: 0, projectionM: 0.12 })
    expect(free.cuts).toEqual([
      { wall: 0, fromLength: 0, lengthM: expect.closeTo(2.12, 9), kind: 'wall' },
      { wall: 0, fromLength: 0, lengthM: expect.closeTo(0.12, 9), kind: 'return' },
    ])
  })

  it('stops short of corner blocks at internal corners and counts the blocks', () => {
    // Derived: a 4 × 3 m room, four internal corners, blocks with 0.15 m legs: each wall loses
    // 2 × 0.15 m; 8 internal ends = 4 corners = 4 blocks; run 14 − 8 × 0.15 = 12.8 m.
    const walls = [4, 3, 4, 3].map(lengthM => ({ lengthM, start: 'internal' as const, end: 'internal' as const }))
    const r = runCutList({ walls, castLengthM: 3, minPieceM: 0.3, sparesPct: 0, cornerBlockLegM: 0.15 })
    expect(r.cornerBlocks).toBe(4)
    expect(r.runM.reduce((a, b) => a + b, 0)).toBeCloseTo(12.8, 9)
    expect(runCutList({ walls, castLengthM: 3, minPieceM: 0.3, sparesPct: 0 }).cornerBlocks).toBe(0) // mitred
  })

  it('loses a saw cut from the length at every cut that leaves an offcut', () => {
    // Two 1.5 m pieces fill a 3 m length without kerf; with a 3 mm kerf the first cut leaves
    // 1.497 m, too short for the second piece, so a second length is started.
    const walls = [{ lengthM: 1.5 }, { lengthM: 1.5 }]
    expect(runCutList({ walls, castLengthM: 3, minPieceM: 0.3, sparesPct: 0 }).usedLengths).toBe(1)
    const r = runCutList({ walls, castLengthM: 3, minPieceM: 0.3, sparesPct: 0, sawCutM: 0.003 })
    expect(r.usedLengths).toBe(2)
    expect(r.sawCuts).toBe(2)
    expect(r.offcutM).toBeCloseTo(2 * (3 - 1.5 - 0.003), 9)
    // a piece that takes the rest of a length needs no cut: 3 m walls from 3 m lengths
    expect(runCutList({ walls: [{ lengthM: 3 }], castLengthM: 3, minPieceM: 0.3, sparesPct: 0, sawCutM: 0.003 }).sawCuts).toBe(0)
  })

  it('throws a named error on bad input', () => {
    const ok = { walls: room, castLengthM: 3, minPieceM: 0.3, sparesPct: 10 }
    expect(fieldOf(() => runCutList({ ...ok, castLengthM: 0 }))).toBe('castLengthM')
    expect(fieldOf(() => runCutList({ ...ok, castLengthM: -3 }))).toBe('castLengthM')
    expect(fieldOf(() => runCutList({ ...ok, minPieceM: 3.5 }))).toBe('minPieceM')
    expect(fieldOf(() => runCutList({ ...ok, sparesPct: -1 }))).toBe('sparesPct')
    expect(fieldOf(() => runCutList({ ...ok, walls: [] }))).toBe('walls')
    expect(fieldOf(() => runCutList({ ...ok, walls: [{ lengthM: 0 }] }))).toBe('walls[0].lengthM')
    expect(fieldOf(() => runCutList({ ...ok, walls: [{ lengthM: 4 }, { lengthM: 0.2 }] }))).toBe('walls[1].lengthM')
    // 3.5 m cannot be cut into pieces of 2–3 m: one is too short, two too long
    expect(fieldOf(() => runCutList({ ...ok, walls: [{ lengthM: 3.5 }], minPieceM: 2 }))).toBe('walls[0].lengthM')
    expect(fieldOf(() => runCutList({ ...ok, walls: [{ lengthM: 1000 }], castLengthM: 0.1, minPieceM: 0 }))).toBe('walls')
    expect(fieldOf(() => runCutList({ ...ok, walls: [{ lengthM: 2, end: 'external' }] }))).toBe('projectionM')
    expect(fieldOf(() => runCutList({ ...ok, walls: [{ lengthM: 2, end: 'bent' as 'external' }], projectionM: 0.1 }))).toBe('walls[0].end')
    expect(fieldOf(() => runCutList({ ...ok, sawCutM: 0.5 }))).toBe('sawCutM')
    expect(fieldOf(() => runCutList({ ...ok, walls: [{ lengthM: 0.2, start: 'internal', end: 'internal' }], cornerBlockLegM: 0.1 }))).toBe('walls[0].lengthM')
  })
})

describe('bagsForKg', () => {
  it('rounds up to whole bags', () => {
    expect(bagsForKg(50, 25)).toBe(2)
    expect(bagsForKg(50.01, 25)).toBe(3)
    expect(bagsForKg(0, 25)).toBe(0)
    expect(bagsForKg(0.3, 0.1)).toBe(3) // float: 0.3 / 0.1 = 2.9999999999999996
    expect(bagsForKg(0.7, 0.1)).toBe(7) // float: 0.7 / 0.1 = 6.999999999999999
    // Worked example (derived): a modest fibrous cornice weighs about 2 kg/m (common practice, no
    // published source); gypsum ≈ plaster × 1.19, so ≈ 1.6 kg plaster/m, plus 15–25 % waste
    // ≈ 2 kg plaster/m; × 16.9 m ≈ 34 kg ≈ 1.4 bags of 25 kg → 2 bags
    expect(bagsForKg(2 * 16.9, 25)).toBe(2)
  })

  it('throws a named error on bad input', () => {
    expect(fieldOf(() => bagsForKg(-1, 25))).toBe('kg')
    expect(fieldOf(() => bagsForKg(10, 0))).toBe('bagKg')
  })
})

describe('unit conversions (NIST SP 811 exact definitions)', () => {
  it('uses the exact factors', () => {
    expect(lbToKg(1)).toBe(0.45359237) // NIST SP 811: 1 lb = 0.45359237 kg exactly
    expect(inToMm(1)).toBe(25.4) // NIST SP 811: 1 in = 25.4 mm exactly
    expect(usGallonsToLitres(1)).toBe(3.785411784) // NIST SP 811: 1 US gal = 3.785411784 L exactly
    expect(kgToLb(0.45359237)).toBeCloseTo(1, 14)
    expect(mmToIn(25.4)).toBe(1)
    expect(litresToUsGallons(3.785411784)).toBe(1)
  })

  it('converts temperatures at the fixed points', () => {
    expect(cToF(0)).toBe(32)
    expect(cToF(100)).toBe(212)
    expect(cToF(-40)).toBe(-40) // the scales cross at −40
    expect(fToC(120)).toBeCloseTo(48.889, 3) // the trade's 120 °F drying limit (common practice)
    expect(fToC(212)).toBe(100)
  })

  it('turns 50 lb of plaster at consistency 70 into 4.19 US gallons of water', () => {
    // Derived: 50 lb × 0.70 = 35 lb = 15.876 kg ≈ 15.876 L at 1.00 kg/L = 4.194 US gal (35 lb / 8.34 lb per gal, the usual round figure, gives 4.20)
    expect(litresToUsGallons(lbToKg(50) * 0.7)).toBeCloseTo(4.194, 3)
  })

  it('throws on a non-finite value', () => {
    expect(fieldOf(() => cToF(Number.NaN))).toBe('tempC')
    expect(fieldOf(() => kgToLb(Infinity))).toBe('kg')
    expect(fieldOf(() => inToMm(Number.NaN))).toBe('in')
  })
})
