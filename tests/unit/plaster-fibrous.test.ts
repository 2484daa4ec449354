import { describe, it, expect } from 'vitest'
import {
  GRADE_PRESETS, PLASTER_CAST_THICKNESS_MM, PlasterInputError, batchForCavity, castFromBatch,
  consumablesForPour, consumablesKgPerPiece, dryingThicknessMm, mouldCastFromRow, pieceLitres, pieceMasses,
  piecesPerPour, pourLitres, poursForPieces, shellLitres, suggestedScrimM2, type CastConsumable,
} from '#shared/utils/plaster'
import { jobPieceMarks, markRange, stockPieceMarks } from '#shared/utils/piece-marks'

const beta = GRADE_PRESETS['beta-casting']

function fieldOf(fn: () => unknown): string | undefined {
  try {
    fn()
  }
  catch (e) {
    if (e instanceof PlasterInputError) return e.field
    throw e
  }
  return undefined
}

describe('fibrous casts: our own worked example', () => {
  // Our own worked example, by hand: a fibrous cornice length whose face is 0.45 m of girth ×
  // 1.2 m = 0.54 m², laid up 10 mm thick. Shell = 0.54 × 10 = 5.4 L (1 m² × 1 mm = 1 L, the SI
  // litre). Beta plaster (powder 2.63 kg/L) at 70 parts water: a kg of powder makes
  // 1/2.63 + 0.70 = 1.080228 L of slurry, so plaster = 5.4 / 1.080228 = 4.9989 kg and
  // water = 4.9989 × 0.70 = 3.4993 kg. Scrim, two layers with 10 % laps: 0.54 × 2 × 1.1 = 1.188 m².
  const mould = { castType: 'fibrous' as const, cavityLitres: 40, cavities: 1, surfaceAreaM2: 0.54, shellThicknessMm: 10 }

  it('takes its plaster from the face and the shell, not the cavity', () => {
    expect(shellLitres({ surfaceAreaM2: 0.54, shellThicknessMm: 10 })).toBeCloseTo(5.4, 10)
    expect(pieceLitres(mould)).toBeCloseTo(5.4, 10)
    const batch = batchForCavity({ cavityLitres: pourLitres(mould), consistency: 70, grade: beta })
    expect(batch.plasterKg).toBeCloseTo(4.9989, 4)
    expect(batch.waterKg).toBeCloseTo(3.4993, 4)
  })

  it('suggests scrim from the face: layers × laps', () => {
    expect(suggestedScrimM2({ surfaceAreaM2: 0.54 })).toBeCloseTo(1.188, 10)
    expect(suggestedScrimM2({ surfaceAreaM2: 0.54, layers: 1, lapPct: 0 })).toBeCloseTo(0.54, 10)
  })

  it('dries through its shell; a solid cast through the usual section', () => {
    expect(dryingThicknessMm(mould)).toBe(10)
    expect(dryingThicknessMm({ castType: 'solid', shellThicknessMm: null })).toBe(PLASTER_CAST_THICKNESS_MM)
  })

  it('carries its scrim and laths in its dry mass and handling weight', () => {
    // our example's own figures: scrim 0.3 kg/m², a lath 0.25 kg; 1.188 × 0.3 + 3 × 0.25 = 1.1064 kg
    const consumables: CastConsumable[] = [
      { consumableId: 1, name: 'Hessian scrim', unit: 'm2', quantityPerCast: 1.188, kgPerUnit: 0.3 },
      { consumableId: 2, name: 'Timber lath', unit: 'each', quantityPerCast: 3, kgPerUnit: 0.25 },
      { consumableId: 3, name: 'Wire ties', unit: 'each', quantityPerCast: 4, kgPerUnit: null },
    ]
    expect(consumablesKgPerPiece(consumables)).toBeCloseTo(1.1064, 10)
    const cast = { dryMassKg: 6, wetMassKg: 8.5 }
    const m = pieceMasses({ cast, mould, consumables })
    expect(m.dryMassKg).toBeCloseTo(7.1064, 10)
    expect(m.wetMassKg).toBeCloseTo(9.6064, 10)
    // the free water is the plaster's alone: the consumables add the same to both
    expect(m.wetMassKg - m.dryMassKg).toBeCloseTo(2.5, 10)
  })

  it('needs its face area and shell thickness', () => {
    expect(fieldOf(() => pieceLitres({ ...mould, surfaceAreaM2: null }))).toBe('surfaceAreaM2')
    expect(fieldOf(() => pieceLitres({ ...mould, shellThicknessMm: 0 }))).toBe('shellThicknessMm')
    expect(fieldOf(() => shellLitres({ surfaceAreaM2: 101, shellThicknessMm: 10 }))).toBe('surfaceAreaM2')
  })
})

describe('multi-cavity moulds', () => {
  // Our own example: an enrichment mould casting four paterae of 0.35 L each fills 1.4 L a pour;
  // beta at 70: 1.4 / 1.080228 = 1.2960 kg plaster, 0.9072 kg water (hand arithmetic as above).
  const paterae = { castType: 'solid' as const, cavityLitres: 0.35, cavities: 4 }

  it('batches every cavity in one pour', () => {
    expect(pourLitres(paterae)).toBeCloseTo(1.4, 10)
    const batch = batchForCavity({ cavityLitres: pourLitres(paterae), consistency: 70, grade: beta })
    expect(batch.plasterKg).toBeCloseTo(1.2960, 4)
    expect(batch.waterKg).toBeCloseTo(0.9072, 4)
    // four times one cavity's batch: the batch is linear in the volume
    expect(batch.plasterKg).toBeCloseTo(4 * batchForCavity({ cavityLitres: 0.35, consistency: 70, grade: beta }).plasterKg, 10)
  })

  it('counts pours and pieces: 10 paterae take 3 pours', () => {
    expect(piecesPerPour(paterae)).toBe(4)
    expect(poursForPieces(10, paterae)).toBe(3)
    expect(poursForPieces(8, paterae)).toBe(2)
    expect(poursForPieces(0, paterae)).toBe(0)
    expect(poursForPieces(3, { cavities: 1 })).toBe(3)
  })

  it('shares the cast between its pieces', () => {
    const cast = castFromBatch({ plasterKg: 1.296, waterKg: 0.9072, grade: beta })
    const one = pieceMasses({ cast, mould: paterae })
    expect(one.dryMassKg * 4).toBeCloseTo(cast.dryMassKg, 10)
    expect(one.wetMassKg * 4).toBeCloseTo(cast.wetMassKg, 10)
  })

  it('uses consumables per cast × cavities', () => {
    const used = consumablesForPour([{ consumableId: 7, name: 'Scrim', unit: 'm2', quantityPerCast: 0.1 }], paterae)
    expect(used[0]!.quantity).toBeCloseTo(0.4, 10)
  })

  it('refuses a cavity count that is not a whole number from 1 to 100', () => {
    expect(fieldOf(() => pourLitres({ ...paterae, cavities: 0 }))).toBe('cavities')
    expect(fieldOf(() => pourLitres({ ...paterae, cavities: 2.5 }))).toBe('cavities')
    expect(fieldOf(() => pourLitres({ ...paterae, cavities: 101 }))).toBe('cavities')
  })

  it('reads a moulds row (NUMERIC as text or number)', () => {
    expect(mouldCastFromRow({ cast_type: 'fibrous', cavity_litres: '5.4', cavities: 2, surface_area_m2: '0.540', shell_thickness_mm: 10 }))
      .toEqual({ castType: 'fibrous', cavityLitres: 5.4, cavities: 2, surfaceAreaM2: 0.54, shellThicknessMm: 10 })
    expect(mouldCastFromRow({ cavity_litres: 1 })).toEqual({ castType: 'solid', cavityLitres: 1, cavities: 1, surfaceAreaM2: null, shellThicknessMm: null })
  })
})

describe('piece marks: one printable scheme', () => {
  it('numbers a pour\'s job pieces one after the other', () => {
    expect(jobPieceMarks('J-2601', 17, 4)).toEqual(['J-2601#017', 'J-2601#018', 'J-2601#019', 'J-2601#020'])
    expect(jobPieceMarks('J-2601', 1, 1)).toEqual(['J-2601#001'])
  })

  it('marks stock pieces by pull, and by cavity when there are several', () => {
    expect(stockPieceMarks('CR-101', 117, 1)).toEqual(['CR-101#M117'])
    expect(stockPieceMarks('PT-4', 3, 2)).toEqual(['PT-4#M003.1', 'PT-4#M003.2'])
  })

  it('labels a pour\'s marks as a range', () => {
    expect(markRange(['J-2601#017'])).toBe('J-2601#017')
    expect(markRange(jobPieceMarks('J-2601', 17, 4))).toBe('J-2601#017–#020')
    expect(markRange([])).toBe('')
  })
})
