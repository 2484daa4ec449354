/**
 * Grade presets: starting points a shop edits, each field with its provenance.
 * Re-exported from `plaster.ts`. Pure data, no I/O.
 */
import { PlasterInputError, SOUTHARD_HYDRATION_HEAT, type PlasterGrade } from './plaster-core'

/** Keys of the built-in grade presets. */
export type PlasterGradePresetKey = 'beta-casting' | 'beta-fibrous' | 'alpha-casting'

/** A preset: a PlasterGrade plus its display label. */
export interface PlasterGradePreset extends PlasterGrade {
  label: string
}

/** Where a preset value comes from. */
export type PlasterProvenanceStatus = 'published' | 'derived' | 'shop starting point (common practice)'

/** Provenance of one preset field: its status and the source or reasoning. */
export interface PlasterFieldProvenance {
  status: PlasterProvenanceStatus
  source: string
}

/**
 * Set-time multiplier against slurry temperature, shared by the presets (shop starting point,
 * common practice): flat from 20 to 40 °C, as Ridge (Nature 184, 1959) found for the induction
 * period; slower in the cold, as shops find (Ridge saw little change down to 0 °C in a Dewar, so the
 * cold-side numbers are for the shop's register to correct); slower again above 40 °C (Ridge).
 */
const SHOP_TEMPERATURE_FACTORS: [number, number][] = [
  [0, 1.6], [5, 1.45], [10, 1.3], [15, 1.15], [20, 1], [40, 1], [50, 1.3], [60, 1.8],
]

/** Powder densities, g/cm³. β 2.63: the design value, inside 2.619–2.637 (Ullmann's, "Calcium sulfate", recalled from memory). */
const BETA_DENSITY = 2.63
/** α 2.76: an Elsevier reference-module text on gypsum gives 2.76; Ullmann's, "Calcium sulfate", 2.757 (recalled from memory). */
const ALPHA_DENSITY = 2.76

function deepFreeze<T>(value: T): T {
  if (typeof value === 'object' && value !== null) {
    Object.values(value).forEach(deepFreeze)
    Object.freeze(value)
  }
  return value
}

/**
 * Built-in grades. Frozen: copy one with `plasterGradeFromPreset` before editing it.
 * The beta casting preset at consistency 70 and slurry 20 °C opens its demould window at
 * 30 min, inside the 20–45 min that is common practice for such a plaster.
 */
export const GRADE_PRESETS: Readonly<Record<PlasterGradePresetKey, PlasterGradePreset>> = deepFreeze({
  'beta-casting': {
    label: 'Beta fine casting plaster',
    form: 'beta',
    powderDensity: BETA_DENSITY,
    consistency: { min: 60, max: 80, default: 70 },
    demouldMinutesRef: 30,
    setTimeWaterExponent: 1.2,
    temperatureFactors: SHOP_TEMPERATURE_FACTORS.map(([t, f]): [number, number] => [t, f]),
    hydrationHeat: SOUTHARD_HYDRATION_HEAT.beta,
    setExpansionPct: 0.2,
    purity: 1,
  },
  'beta-fibrous': {
    label: 'Beta fibrous plaster',
    form: 'beta',
    powderDensity: BETA_DENSITY,
    consistency: { min: 60, max: 80, default: 70 },
    demouldMinutesRef: 40,
    setTimeWaterExponent: 1.2,
    temperatureFactors: SHOP_TEMPERATURE_FACTORS.map(([t, f]): [number, number] => [t, f]),
    hydrationHeat: SOUTHARD_HYDRATION_HEAT.beta,
    setExpansionPct: 0.2,
    purity: 1,
  },
  'alpha-casting': {
    label: 'Alpha hard casting plaster',
    form: 'alpha',
    powderDensity: ALPHA_DENSITY,
    consistency: { min: 28, max: 40, default: 35 },
    demouldMinutesRef: 45,
    setTimeWaterExponent: 1.2,
    temperatureFactors: SHOP_TEMPERATURE_FACTORS.map(([t, f]): [number, number] => [t, f]),
    hydrationHeat: SOUTHARD_HYDRATION_HEAT.alpha,
    setExpansionPct: 0.15,
    purity: 1,
  },
})

const COMMON = 'shop starting point (common practice)' as const

const SHARED_PROVENANCE = {
  form: { status: 'derived', source: 'by definition of the grade' },
  setTimeWaterExponent: {
    status: COMMON,
    source: 'more water sets later (dental and plaster texts); a dental-text table recalled from memory implies m ≈ 1.25; the register calibrates it',
  },
  temperatureFactors: {
    status: COMMON,
    source: 'flat 20–40 °C per Ridge, Nature 184 (1959); slower when cold and above 40 °C; the register calibrates it',
  },
  purity: {
    status: COMMON,
    source: 'assumes pure hemihydrate; the model then meets published dry densities at consistency 60–74 within about 2 %; enter the assay when known',
  },
} satisfies Partial<Record<keyof PlasterGrade, PlasterFieldProvenance>>

const BETA_PROVENANCE = {
  ...SHARED_PROVENANCE,
  powderDensity: {
    status: 'published',
    source: 'β-hemihydrate 2.62–2.64 g/cm³ (Ullmann\'s Encyclopedia, "Calcium sulfate", 2.619–2.637, recalled from memory; reference texts give 2.64)',
  },
  consistency: { status: COMMON, source: 'beta casting and moulding plasters are gauged at about 65–74, typically 70' },
  hydrationHeat: { status: 'published', source: 'Southard, Ind. Eng. Chem. 32 (1940): −4600 cal/mol → 132.6 J/g' },
  setExpansionPct: { status: COMMON, source: 'about 0.2 % linear for beta casting plasters' },
} satisfies Partial<Record<keyof PlasterGrade, PlasterFieldProvenance>>

/** Provenance of every field of every preset: published (with source), derived, or a shop starting point. */
export const GRADE_PRESET_PROVENANCE: Readonly<Record<PlasterGradePresetKey, Record<keyof PlasterGrade, PlasterFieldProvenance>>> = deepFreeze({
  'beta-casting': {
    ...BETA_PROVENANCE,
    demouldMinutesRef: { status: COMMON, source: 'a beta casting plaster at 70 and 20 °C demoulds in about 20–45 min (common practice); ASTM C59\'s 10–50 min limits apply to the powder\'s needle set, not to demoulding' },
  },
  'beta-fibrous': {
    ...BETA_PROVENANCE,
    demouldMinutesRef: { status: COMMON, source: 'fibrous casts in a reverse mould demould when the heat has died away, about 30–60 min after gauging' },
  },
  'alpha-casting': {
    ...SHARED_PROVENANCE,
    powderDensity: {
      status: 'published',
      source: 'α-hemihydrate 2.76 g/cm³ (reference texts; Ullmann\'s Encyclopedia gives 2.757, recalled from memory)',
    },
    consistency: { status: COMMON, source: 'hard alpha casting plasters are gauged at about 28–40 parts water' },
    demouldMinutesRef: { status: COMMON, source: 'alpha plasters set in roughly 17–35 min; demould follows the heat peak' },
    hydrationHeat: { status: 'published', source: 'Southard, Ind. Eng. Chem. 32 (1940): −4100 cal/mol → 118.2 J/g' },
    setExpansionPct: { status: COMMON, source: 'alpha plasters expand about 0.08–0.39 % by product; 0.15 % is a middle value' },
  },
})

/** A deep, editable copy of a preset (the presets themselves are frozen). */
export function plasterGradeFromPreset(key: PlasterGradePresetKey): PlasterGradePreset {
  const preset = GRADE_PRESETS[key]
  if (!preset || !Object.hasOwn(GRADE_PRESETS, key)) {
    throw new PlasterInputError('key', `key must be one of ${Object.keys(GRADE_PRESETS).join(', ')}`)
  }
  return {
    ...preset,
    consistency: { ...preset.consistency },
    temperatureFactors: preset.temperatureFactors.map(([t, f]): [number, number] => [t, f]),
  }
}
