import type { PlasterGrade } from '../utils/plaster-core'

/** A grade the mix card offers: the workshop's own (numeric id) or a preset (its key). */
export interface MixGradeOption { id: number | string; name: string; bagKg: number; grade: PlasterGrade }
/** A mould the mix card offers. */
export interface MixMouldOption { id: number; code: string; casts: string; cavityLitres: number; maxDwellMinutes: number }
