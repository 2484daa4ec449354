// Stock on hand of a lot, the mould life warning, item pieces and plaster, and the shared
// catalogue schemas. Check values are worked by hand from the definitions in catalogue.ts.
import { describe, expect, it } from 'vitest'
import {
  LOW_STOCK_BAGS, plasterGradeFromRow, itemPiecesNeeded, itemPlaster, jobReleased, lotStock, lotUsedKg, mouldLife,
} from '#shared/utils/catalogue'
import { GRADE_PRESETS, batchForCavity } from '#shared/utils/plaster'
import { lotCreateSchema, mouldCreateSchema, mouldStateSchema } from '#shared/utils/catalogue-schemas'
import { jobItemCreateSchema, sampleDecisionSchema } from '#shared/utils/job-schemas'

const sums = (state: string, actualKg: number, plannedWithoutActualKg: number) => ({ state: state as 'planned', actualKg, plannedWithoutActualKg })

describe('lotUsedKg and lotStock', () => {
  it('counts actual weights, planned weights only once mixing started, and never void pours', () => {
    const used = lotUsedKg([
      sums('planned', 0, 30), // planned pours have not touched the bag
      sums('mixing', 0, 6), // started, no weight recorded yet: planned counts
      sums('demoulded', 20.5, 2), // 20.5 recorded + 2 planned of one without a weight
      sums('void', 9, 9),
    ])
    expect(used).toBeCloseTo(6 + 20.5 + 2, 9)
  })

  it('on hand = bags × bag mass − used, in kg and bags, with the low-stock flag below two bags', () => {
    const s = lotStock({ bagsReceived: 4, bagKg: 25, useBy: null, today: '2026-12-02', pours: [sums('demoulded', 55, 0)] })
    expect(s.receivedKg).toBe(100)
    expect(s.onHandKg).toBe(45)
    expect(s.onHandBags).toBe(1.8)
    expect(s.lowStock).toBe(true)
    expect(s.warnings[0]).toMatch(/Low stock/)
    const ok = lotStock({ bagsReceived: 4, bagKg: 25, useBy: null, today: '2026-12-02', pours: [sums('demoulded', 50, 0)] })
    expect(ok.onHandKg).toBe(LOW_STOCK_BAGS * 25)
    expect(ok.lowStock).toBe(false)
  })

  it('never shows negative stock and flags plaster past its use-by day (not on the day itself)', () => {
    const s = lotStock({ bagsReceived: 1, bagKg: 25, useBy: '2026-12-01', today: '2026-12-02', pours: [sums('setting', 40, 0)] })
    expect(s.onHandKg).toBe(0)
    expect(s.pastUseBy).toBe(true)
    expect(s.warnings.join(' ')).toMatch(/sets unpredictably/)
    expect(lotStock({ bagsReceived: 9, bagKg: 25, useBy: '2026-12-02', today: '2026-12-02', pours: [] }).pastUseBy).toBe(false)
  })

  it('words its warnings in the workshop\'s units and day style', () => {
    const s = lotStock({ bagsReceived: 1, bagKg: 25, useBy: '2026-12-01', today: '2026-12-02', pours: [], units: 'imperial', day: d => `day ${d}` })
    // two 25 kg bags = 50 kg = 110 lb in whole pounds (50 / 0.45359237 = 110.2, NIST SP 811)
    expect(s.warnings[0]).toBe('Low stock: under 2 bags (110 lb) left')
    expect(s.warnings[1]).toMatch(/^Past its use-by date \(day 2026-12-01\)/)
    expect(lotStock({ bagsReceived: 1, bagKg: 25, useBy: null, today: '2026-12-02', pours: [] }).warnings[0]).toBe('Low stock: under 2 bags (50 kg) left')
  })
})

describe('mouldLife', () => {
  it('flags a mould at 90 % of its expected life and past it at 100 %', () => {
    expect(mouldLife({ pulls: 134, expectedPulls: 150 }).nearEnd).toBe(false) // 89.3 %
    const at90 = mouldLife({ pulls: 135, expectedPulls: 150 })
    expect(at90.nearEnd).toBe(true)
    expect(at90.pastEnd).toBe(false)
    expect(at90.label).toMatch(/Near end of life.*90 %/)
    expect(mouldLife({ pulls: 150, expectedPulls: 150 }).pastEnd).toBe(true)
  })
  it('gives no warning without an expected life', () => {
    expect(mouldLife({ pulls: 900, expectedPulls: null })).toMatchObject({ share: null, nearEnd: false, pastEnd: false })
  })
})

describe('items', () => {
  it('pieces are the quantity when given, else the cut list lengths with spares', () => {
    expect(itemPiecesNeeded({ quantity: 6 }).pieces).toBe(6)
    // four walls of 5.2, 4.1, 5.2, 4.1 m from 1.2 m lengths: 5 + 4 + 5 + 4 segments (worked in the cut list tests) → 16 used, +10 % → 18
    const r = itemPiecesNeeded({ run: { walls: [{ lengthM: 5.2 }, { lengthM: 4.1 }, { lengthM: 5.2 }, { lengthM: 4.1 }], castLengthM: 1.2, minPieceM: 0.3, sparesPct: 10 } })
    expect(r.cutList!.usedLengths + r.cutList!.spareLengths).toBe(r.pieces)
    expect(r.cutList!.spareLengths).toBe(Math.ceil(r.cutList!.usedLengths * 0.1))
  })
  it('plaster for a run is one batch per cast times the pieces, in whole bags', () => {
    const grade = GRADE_PRESETS['beta-casting']
    const one = batchForCavity({ cavityLitres: 6.5, consistency: 70, grade, wastePct: 5 })
    const p = itemPlaster({ pieces: 18, cavityLitres: 6.5, consistency: 70, grade, bagKg: 25 })
    expect(p.plasterKg).toBeCloseTo(one.plasterKg * 18, 9)
    expect(p.bags).toBe(Math.ceil(p.plasterKg / 25))
  })
  it('maps a grade row to the model and releases a job only without a sample or after approval', () => {
    const g = GRADE_PRESETS['alpha-casting']
    const row = { form: g.form, powder_density: g.powderDensity, consistency_min: 28, consistency_max: 40, consistency_default: 35, demould_minutes_ref: 45, set_time_water_exponent: 1.2, temperature_factors: g.temperatureFactors.map(([t, f]): [number, number] => [t, f]), hydration_heat: g.hydrationHeat, set_expansion_pct: 0.15, purity: 1 }
    expect(plasterGradeFromRow(row).consistency).toEqual({ min: 28, max: 40, default: 35 })
    expect(jobReleased({ sample_required: true, sample_state: 'awaiting_approval' })).toBe(false)
    expect(jobReleased({ sample_required: true, sample_state: 'approved' })).toBe(true)
    expect(jobReleased({ sample_required: false, sample_state: 'not_required' })).toBe(true)
  })
})

describe('schemas name the bad field', () => {
  const path = (r: { success: boolean; error?: { issues: { path: PropertyKey[] }[] } }) => r.error?.issues[0]?.path.join('.')
  it('lots: use-by before received', () => {
    expect(path(lotCreateSchema.safeParse({ gradeId: 1, lotCode: 'A', bagsReceived: 2, bagKg: 25, receivedOn: '2026-12-02', useBy: '2026-11-01' }))).toBe('useBy')
  })
  it('moulds: cavity must be positive; repair needs a reason', () => {
    const base = { code: 'M-1', casts: 'x', material: 'silicone', cavityLitres: 0, prepMinutes: 1, cleanMinutes: 1, maxDwellMinutes: 1, pulls: 0 }
    expect(path(mouldCreateSchema.safeParse(base))).toBe('cavityLitres')
    expect(path(mouldStateSchema.safeParse({ state: 'repair', version: 1 }))).toBe('reason')
  })
  it('items: a run needs walls and a mould; pieces need a quantity', () => {
    expect(path(jobItemCreateSchema.safeParse({ kind: 'pieces', mouldId: 1, description: 'x' }))).toBe('quantity')
    expect(path(jobItemCreateSchema.safeParse({ kind: 'run', mouldId: 1, description: 'x' }))).toBe('walls')
    expect(path(jobItemCreateSchema.safeParse({ kind: 'run', mouldId: 1, description: 'x', walls: [{ lengthM: -1 }] }))).toBe('walls.0.lengthM')
  })
  it('sample decision: asking for changes needs a comment', () => {
    expect(path(sampleDecisionSchema.safeParse({ decision: 'changes_requested' }))).toBe('comment')
    expect(sampleDecisionSchema.safeParse({ decision: 'approved' }).success).toBe(true)
  })
})
