import type { CastType } from '../utils/plaster-fibrous'
import type { PlasterGrade } from '../utils/plaster-core'
import type { UnitSystem } from '../utils/units-display'
import type { GradeCalibration } from './catalogue'

/** A grade the mix card offers: the workshop's own (numeric id) or a preset (its key). */
export interface MixGradeOption { id: number | string; name: string; bagKg: number; grade: PlasterGrade; calibration?: GradeCalibration }
/** A mould the mix card offers. `cavityLitres`: the slurry one pour takes (every cavity, or the fibrous shell: plaster-fibrous.ts pourLitres). */
export interface MixMouldOption { id: number; code: string; casts: string; cavityLitres: number; maxDwellMinutes: number; cavities?: number; castType?: CastType }

/** GET /api/calc/options: what the mix card offers, in the workshop's units and usual shop temperature. */
export interface MixOptions {
  units: UnitSystem
  defaultShopTempC: number
  grades: (MixGradeOption & { id: number; calibration: GradeCalibration })[]
  moulds: (MixMouldOption & { state: string })[]
}
