import { describe, it, expect } from 'vitest'
import fc from 'fast-check'
import {
  GRADE_PRESETS,
  batchForCavity,
  calibrationFactor,
  cToF,
  castFromBatch,
  demouldReadyMinutes,
  fToC,
  inToMm,
  kgToLb,
  lbToKg,
  litresToUsGallons,
  mmToIn,
  runCutList,
  usGallonsToLitres,
  wetBulbC,
  type PlasterGradePresetKey,
  type PlasterRunEnd,
} from '#shared/utils/plaster'

const EPS = 1e-9
const grades = fc.constantFrom(...(Object.keys(GRADE_PRESETS) as PlasterGradePresetKey[])).map(k => GRADE_PRESETS[k])
const num = (min: number, max: number) => fc.double({ min, max, noNaN: true, noDefaultInfinity: true })

describe('set and cast properties', () => {
  it('more water → later demould and lower dry density', () => {
    fc.assert(fc.property(grades, num(18.6, 199), num(0.5, 50), num(0, 60), (grade, c1, extra, t) => {
      const c2 = Math.min(200, c1 + extra)
      const ready = (c: number) => demouldReadyMinutes({ grade, consistency: c, slurryTempC: t })
      const density = (c: number) => castFromBatch({ plasterKg: 1, waterKg: c / 100, grade }).dryDensity
      expect(ready(c2)).toBeGreaterThan(ready(c1))
      expect(density(c2)).toBeLessThan(density(c1))
    }))
  })

  it('slurry colder than 20 °C → later demould', () => {
    fc.assert(fc.property(grades, num(0, 19.99), (grade, t) => {
      const c = grade.consistency.default
      expect(demouldReadyMinutes({ grade, consistency: c, slurryTempC: t }))
        .toBeGreaterThan(demouldReadyMinutes({ grade, consistency: c, slurryTempC: 20 }))
    }))
  })

  it('more cavity → proportionally more plaster and water', () => {
    fc.assert(fc.property(grades, num(0.01, 100), num(1, 10), num(20, 150), num(0, 50), (grade, v, k, c, waste) => {
      const one = batchForCavity({ cavityLitres: v, consistency: c, grade, wastePct: waste })
      const many = batchForCavity({ cavityLitres: v * k, consistency: c, grade, wastePct: waste })
      expect(many.plasterKg / one.plasterKg).toBeCloseTo(k, 9)
      expect(many.waterKg / one.waterKg).toBeCloseTo(k, 9)
    }))
  })

  it('the cast conserves mass: dry mass + free water = plaster + water', () => {
    fc.assert(fc.property(grades, num(0.01, 100), num(18.7, 200), num(0.5, 1), (grade, kg, c, purity) => {
      const cast = castFromBatch({ plasterKg: kg, waterKg: (kg * c) / 100, grade: { ...grade, purity } })
      expect(cast.dryMassKg + cast.freeWaterKg).toBeCloseTo(cast.wetMassKg, 9)
      expect(cast.porosity).toBeGreaterThan(0)
      expect(cast.porosity).toBeLessThan(1)
    }))
  })
})

describe('runCutList properties', () => {
  const job = fc.record({
    castLengthM: num(0.5, 6),
    minFraction: num(0, 0.5),
    extras: fc.array(num(0.01, 30), { minLength: 1, maxLength: 12 }),
    sparesPct: num(0, 30),
  })

  it('never yields a piece shorter than minPieceM or longer than castLengthM, and covers each wall exactly', () => {
    fc.assert(fc.property(job, ({ castLengthM, minFraction, extras, sparesPct }) => {
      const minPieceM = castLengthM * minFraction
      const walls = extras.map(e => ({ lengthM: minPieceM + e }))
      const r = runCutList({ walls, castLengthM, minPieceM, sparesPct })
      const perWall = walls.map(() => 0)
      const perLength = Array<number>(r.usedLengths).fill(0)
      for (const cut of r.cuts) {
        expect(cut.lengthM).toBeGreaterThanOrEqual(minPieceM - EPS)
        expect(cut.lengthM).toBeLessThanOrEqual(castLengthM + EPS)
        perWall[cut.wall]! += cut.lengthM
        perLength[cut.fromLength]! += cut.lengthM
      }
      walls.forEach((w, i) => expect(Math.abs(perWall[i]! - w.lengthM)).toBeLessThan(1e-8))
      perLength.forEach(used => expect(used).toBeLessThanOrEqual(castLengthM + 1e-8))
      const total = walls.reduce((a, w) => a + w.lengthM, 0)
      expect(r.usedLengths).toBeGreaterThanOrEqual(Math.ceil(total / castLengthM - 1e-9))
      expect(r.lengths).toBe(r.usedLengths + r.spareLengths)
      expect(r.spareLengths).toBeGreaterThanOrEqual((r.usedLengths * sparesPct) / 100 - 1e-9)
      expect(r.offcutM).toBeCloseTo(r.usedLengths * castLengthM - total, 6)
    }))
  })

  const END = fc.constantFrom('square', 'internal', 'external', 'return') as fc.Arbitrary<PlasterRunEnd>
  const cornered = fc.record({
    castLengthM: num(0.5, 6),
    minFraction: num(0, 0.5),
    walls: fc.array(fc.record({ extra: num(0.01, 30), start: END, end: END }), { minLength: 1, maxLength: 12 }),
    projectionM: num(0.02, 0.4),
    sawCutM: fc.constantFrom(0, 0.002, 0.004),
  })

  it('with corners and kerf: every wall covered, no wall piece below the minimum, no length over-cut', () => {
    fc.assert(fc.property(cornered, ({ castLengthM, minFraction, walls: w, projectionM, sawCutM }) => {
      const minPieceM = castLengthM * minFraction
      const walls = w.map(({ extra, start, end }) => ({ lengthM: minPieceM + extra, start, end }))
      const r = runCutList({ walls, castLengthM, minPieceM, sparesPct: 0, projectionM: Math.min(projectionM, castLengthM), sawCutM })
      const perWall = walls.map(() => 0)
      const perLength = Array<number>(r.usedLengths).fill(0)
      for (const cut of r.cuts) {
        if (cut.kind === 'wall') {
          expect(cut.lengthM).toBeGreaterThanOrEqual(minPieceM - EPS)
          perWall[cut.wall]! += cut.lengthM
        }
        expect(cut.lengthM).toBeLessThanOrEqual(castLengthM + EPS)
        perLength[cut.fromLength]! += cut.lengthM
      }
      walls.forEach((wall, i) => {
        const mitres = [wall.start, wall.end].filter(e => e === 'external' || e === 'return').length
        expect(r.runM[i]).toBeCloseTo(wall.lengthM + mitres * Math.min(projectionM, castLengthM), 9)
        expect(Math.abs(perWall[i]! - r.runM[i]!)).toBeLessThan(1e-8)
      })
      // pieces plus the kerf of every cut fit in the lengths
      const kerfTotal = r.sawCuts * sawCutM
      expect(perLength.reduce((a, b) => a + b, 0) + kerfTotal).toBeLessThanOrEqual(r.usedLengths * castLengthM + 1e-8)
      perLength.forEach(used => expect(used).toBeLessThanOrEqual(castLengthM + 1e-8))
    }))
  })

  it('never needs more lengths than splitting each wall on its own', () => {
    fc.assert(fc.property(job, ({ castLengthM, minFraction, extras }) => {
      const minPieceM = castLengthM * minFraction
      const walls = extras.map(e => ({ lengthM: minPieceM + e }))
      const r = runCutList({ walls, castLengthM, minPieceM, sparesPct: 0 })
      expect(r.usedLengths).toBeLessThanOrEqual(lengthsSplittingEachWall(walls.map(x => x.lengthM), castLengthM, minPieceM))
    }))
  })
})

/**
 * The rule before offcut reuse, restated independently as the reference: each wall split on its
 * own (full lengths, a short rest balanced with the last full one or an even split), then first-
 * fit decreasing into cast lengths.
 */
function lengthsSplittingEachWall(walls: number[], cast: number, min: number): number {
  const pieces = walls.flatMap((l) => {
    const k = Math.max(1, Math.ceil(l / cast - 1e-9))
    const rest = l - (k - 1) * cast
    if (rest >= min - 1e-9) return [...Array<number>(k - 1).fill(cast), rest]
    if ((cast + rest) / 2 >= min - 1e-9) return [...Array<number>(k - 2).fill(cast), (cast + rest) / 2, (cast + rest) / 2]
    return Array<number>(k).fill(l / k)
  }).sort((a, b) => b - a)
  const left: number[] = []
  for (const p of pieces) {
    const i = left.findIndex(r => r >= p - 1e-9)
    if (i < 0) left.push(cast - p)
    else left[i]! -= p
  }
  return left.length
}

describe('other properties', () => {
  it('metric ↔ imperial round trips', () => {
    fc.assert(fc.property(num(-1e6, 1e6), (x) => {
      expect(fToC(cToF(x))).toBeCloseTo(x, 6)
      expect(cToF(fToC(x))).toBeCloseTo(x, 6)
      expect(lbToKg(kgToLb(x))).toBeCloseTo(x, 6)
      expect(kgToLb(lbToKg(x))).toBeCloseTo(x, 6)
      expect(inToMm(mmToIn(x))).toBeCloseTo(x, 6)
      expect(mmToIn(inToMm(x))).toBeCloseTo(x, 6)
      expect(usGallonsToLitres(litresToUsGallons(x))).toBeCloseTo(x, 6)
    }))
  })

  it('the wet bulb never exceeds the air temperature', () => {
    fc.assert(fc.property(num(-20, 50), num(0, 100), (t, rh) => {
      expect(wetBulbC(t, rh)).toBeLessThanOrEqual(t)
    }))
  })

  it('the calibration factor scales with the shop and stays within the sample ratios', () => {
    const sample = fc.record({ predictedMinutes: num(1, 300), actualMinutes: num(1, 300) })
    fc.assert(fc.property(fc.array(sample, { minLength: 1, maxLength: 40 }), num(0.2, 5), (samples, k) => {
      const { factor, count } = calibrationFactor(samples)
      const ratios = samples.slice(-20).map(s => s.actualMinutes / s.predictedMinutes)
      expect(count).toBe(Math.min(20, samples.length))
      expect(factor).toBeGreaterThanOrEqual(Math.min(...ratios) - 1e-12)
      expect(factor).toBeLessThanOrEqual(Math.max(...ratios) + 1e-12)
      const scaled = calibrationFactor(samples.map(s => ({ ...s, actualMinutes: s.actualMinutes * k })))
      expect(scaled.factor).toBeCloseTo(factor * k, 9)
    }))
  })
})
