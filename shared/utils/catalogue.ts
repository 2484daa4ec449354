/**
 * Pure catalogue arithmetic: stock on hand of a plaster lot, its warnings, the mould life
 * warning, a grade row as the plaster model's PlasterGrade, and how many pieces and how much
 * plaster a job item needs. No I/O; pages and routes both call these.
 */
import type { PlasterGrade } from './plaster-core'
import { batchForCavity } from './plaster'
import { bagsForKg, runCutList, type PlasterRunCutList, type PlasterRunWall } from './plaster-cutlist'
import { formatUnits, type UnitSystem } from './units-display'

/**
 * A lot is low when less than this many full bags are left: two bags cover a day's gauging on
 * one bench and the wait for the next delivery (common practice, a shop judgement; not a
 * published figure).
 */
export const LOW_STOCK_BAGS = 2

/** A mould is flagged when it has given this share of its expected pulls (the 90 %). */
export const MOULD_LIFE_WARN_SHARE = 0.9

/** Bowl and strike-off waste added to each batch of a job's plaster estimate, % (common practice; the demo seed uses the same). */
export const ITEM_WASTE_PCT = 5

export const CATALOGUE_POUR_STATES = ['planned', 'mixing', 'setting', 'demoulded', 'void'] as const
export type CataloguePourState = (typeof CATALOGUE_POUR_STATES)[number]

/** Pours of one lot summed per state: actualKg over pours with a recorded weight, plannedKg over the rest. */
export interface LotPourSums {
  state: CataloguePourState
  actualKg: number
  plannedWithoutActualKg: number
}

/**
 * Plaster taken from a lot by its pours. A recorded actual weight always counts; without one,
 * the planned weight counts only once the caster has started mixing (mixing, setting,
 * demoulded): a planned pour has not touched the bag yet. Void pours never count.
 */
export function lotUsedKg(sums: LotPourSums[]): number {
  return sums.reduce((kg, s) => {
    if (s.state === 'void') return kg
    const started = s.state !== 'planned'
    return kg + s.actualKg + (started ? s.plannedWithoutActualKg : 0)
  }, 0)
}

export interface LotStock {
  receivedKg: number
  usedKg: number
  onHandKg: number
  /** on hand in bags, one decimal (an opened bag shows as a fraction) */
  onHandBags: number
  lowStock: boolean
  pastUseBy: boolean
  warnings: string[]
}

/**
 * Stock on hand = bags received × bag mass − plaster used by the lot's pours (lotUsedKg),
 * never below zero. `today` and `useBy` are calendar days 'YYYY-MM-DD' in the workshop's zone.
 * Old plaster sets unpredictably (common practice), hence the use-by warning. The warnings are
 * worded for people: masses in `units`, the day through `day` (the workshop's day style).
 */
export function lotStock(input: { bagsReceived: number; bagKg: number; useBy: string | null; today: string; pours: LotPourSums[]; units?: UnitSystem; day?: (d: string) => string }): LotStock {
  const receivedKg = input.bagsReceived * input.bagKg
  const usedKg = lotUsedKg(input.pours)
  const onHandKg = Math.max(0, receivedKg - usedKg)
  const onHandBags = Math.floor((onHandKg / input.bagKg) * 10 + 1e-9) / 10
  const lowStock = onHandKg < LOW_STOCK_BAGS * input.bagKg - 1e-9
  const pastUseBy = input.useBy !== null && input.useBy < input.today
  const warnings: string[] = []
  if (lowStock) warnings.push(`Low stock: under ${LOW_STOCK_BAGS} bags (${formatUnits.mass(LOW_STOCK_BAGS * input.bagKg, input.units ?? 'metric', 0)}) left`)
  if (pastUseBy) warnings.push(`Past its use-by date (${input.day ? input.day(input.useBy!) : input.useBy}): old plaster sets unpredictably; test a small batch first`)
  return { receivedKg, usedKg, onHandKg, onHandBags, lowStock, pastUseBy, warnings }
}

export interface MouldLife {
  /** pulls ÷ expected pulls, or null when no life is set */
  share: number | null
  nearEnd: boolean
  pastEnd: boolean
  label: string
}

/** The life warning: flagged at MOULD_LIFE_WARN_SHARE of the expected pulls, past its life at 100 %. */
export function mouldLife(input: { pulls: number; expectedPulls: number | null }): MouldLife {
  if (!input.expectedPulls || input.expectedPulls <= 0) return { share: null, nearEnd: false, pastEnd: false, label: `${input.pulls} pulls, no life set` }
  const share = input.pulls / input.expectedPulls
  const pastEnd = share >= 1
  const nearEnd = share >= MOULD_LIFE_WARN_SHARE - 1e-9
  const pct = Math.round(share * 100)
  const label = pastEnd
    ? `Past its life: ${input.pulls} of ${input.expectedPulls} pulls`
    : nearEnd ? `Near end of life: ${input.pulls} of ${input.expectedPulls} pulls (${pct} %)` : `${input.pulls} of ${input.expectedPulls} pulls (${pct} %)`
  return { share, nearEnd, pastEnd, label }
}

/** The columns of a plaster_grades row the model needs. */
export interface GradeRowLike {
  form: 'beta' | 'alpha'
  powder_density: number | string
  consistency_min: number | string
  consistency_max: number | string
  consistency_default: number | string
  demould_minutes_ref: number | string
  set_time_water_exponent: number | string
  temperature_factors: [number, number][]
  hydration_heat: number | string
  set_expansion_pct: number | string
  purity: number | string
}

/** A plaster_grades row as the plaster model's PlasterGrade (numerics coerced, whatever the driver gave). */
export function plasterGradeFromRow(r: GradeRowLike): PlasterGrade {
  return {
    form: r.form,
    powderDensity: Number(r.powder_density),
    consistency: { min: Number(r.consistency_min), max: Number(r.consistency_max), default: Number(r.consistency_default) },
    demouldMinutesRef: Number(r.demould_minutes_ref),
    setTimeWaterExponent: Number(r.set_time_water_exponent),
    temperatureFactors: r.temperature_factors.map(([t, f]) => [Number(t), Number(f)] as [number, number]),
    hydrationHeat: Number(r.hydration_heat),
    setExpansionPct: Number(r.set_expansion_pct),
    purity: Number(r.purity),
  }
}

/** The calibration columns of a plaster_grades row. */
export interface GradeCalibrationRowLike {
  calibration_factor: number | string | null
  calibration_count: number
  calibration_applied: boolean
  calibration_applied_factor?: number | string | null
  calibration_applied_count?: number
  calibration_excluded?: number
}

/** A grade row's calibration: the live factor from the register and the one a lead applied (plaster-set.ts). */
export function gradeCalibrationFromRow(r: GradeCalibrationRowLike) {
  const applied = r.calibration_applied && r.calibration_applied_factor !== null && r.calibration_applied_factor !== undefined
  return {
    factor: r.calibration_factor === null ? null : Number(r.calibration_factor),
    count: r.calibration_count,
    excluded: r.calibration_excluded ?? 0,
    applied,
    appliedFactor: applied ? Number(r.calibration_applied_factor) : null,
    appliedCount: applied ? r.calibration_applied_count ?? 0 : 0,
  }
}

export interface RunInput {
  walls: PlasterRunWall[]
  castLengthM: number
  minPieceM: number
  sparesPct: number
  projectionM?: number
  sawCutM?: number
  cornerBlockLegM?: number
}

/** Pieces an item needs: the quantity when given, else the run's cast lengths including spares (runCutList). */
export function itemPiecesNeeded(input: { quantity?: number | null; run?: RunInput | null }): { pieces: number; cutList: PlasterRunCutList | null } {
  if (input.quantity !== undefined && input.quantity !== null) return { pieces: input.quantity, cutList: null }
  if (!input.run) return { pieces: 0, cutList: null }
  const cutList = runCutList(input.run)
  return { pieces: cutList.lengths, cutList }
}

export interface ItemPlaster { perPieceKg: number; plasterKg: number; waterKg: number; bags: number }

/**
 * Plaster for `pieces` casts of a cavity: one batch per cast (batchForCavity with ITEM_WASTE_PCT),
 * times the pieces, and the whole bags that covers (bagsForKg). Per cast, so a long run does not
 * hit the model's per-batch cavity limit.
 */
export function itemPlaster(input: { pieces: number; cavityLitres: number; consistency: number; grade: PlasterGrade; bagKg: number }): ItemPlaster {
  const batch = batchForCavity({ cavityLitres: input.cavityLitres, consistency: input.consistency, grade: input.grade, wastePct: ITEM_WASTE_PCT })
  const plasterKg = batch.plasterKg * input.pieces
  return { perPieceKg: batch.plasterKg, plasterKg, waterKg: batch.waterKg * input.pieces, bags: bagsForKg(plasterKg, input.bagKg) }
}

/** The rest of a job goes to the board once no sample is needed or the client approved it. */
export function jobReleased(job: { sample_required: boolean; sample_state: string }): boolean {
  return !job.sample_required || job.sample_state === 'approved'
}
