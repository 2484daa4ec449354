/**
 * What one pour of a mould casts: how many pieces (its cavities), how much slurry, and for a
 * fibrous mould the shell and its consumables. Re-exported from `plaster.ts`.
 *
 * - A solid cast fills its cavity: litres per piece = the mould's cavity volume.
 * - A fibrous cast is a shell of gauged plaster laid up over the mould's face with hessian scrim
 *   and timber laths (common practice). Its plaster comes from the face, not the cavity: a shell's
 *   volume is its area × its thickness, and 1 m² × 1 mm = 0.001 m³ = 1 L exactly (SI definition
 *   of the litre), so litres per piece = surface area (m²) × shell thickness (mm).
 * - A multi-cavity mould (an enrichment mould casting four paterae) is filled in one pour: the
 *   batch covers every cavity (litres per pour = litres per piece × cavities) and each piece
 *   is one share of it (pieceShareOfPour).
 * - Consumables (scrim m², laths m or each, ties …) come from the mould's own list, a quantity
 *   per cast, i.e. per piece: a pour uses quantity × cavities.
 * - A thin shell dries through its own thickness: the drying section of a fibrous piece is its
 *   shell thickness; a solid piece keeps the model's usual section (PLASTER_CAST_THICKNESS_MM).
 * - A fibrous piece carries its scrim and laths: their mass (when the stock says what a unit
 *   weighs) is added to the piece's dry and wet mass, so the dry-by-weight figure and the handling
 *   weight are what the scale and the hands feel.
 *
 * Usual figures, offered as starting points only: a shell of about 10 mm (two gauged coats with
 * the scrim between them; common practice, recalled from memory) and scrim laid in two layers
 * with about 50 mm laps, some 10 % over the face's area per layer (common practice). The shop's
 * own moulds say what they use. Pure: no I/O, no framework import.
 */
import { PLASTER_LIMITS, PlasterInputError, assertPlasterNumber, assertPlasterObject } from './plaster-core'
import { PLASTER_CAST_THICKNESS_MM } from './plaster-drying'

export const CAST_TYPES = ['solid', 'fibrous'] as const
export type CastType = typeof CAST_TYPES[number]

/** A usual fibrous shell, mm: about 10 (common practice, recalled from memory); a form's starting value. */
export const FIBROUS_SHELL_MM_USUAL = 10

/** Scrim over the face's area per layer for laps, %: about 10 (common practice). */
export const SCRIM_LAP_PCT_USUAL = 10

/** Layers of scrim in a usual fibrous cast: 2 (common practice). */
export const SCRIM_LAYERS_USUAL = 2

/** Most cavities one mould may have (a sanity bound, common practice: enrichment moulds hold a handful). */
export const MAX_CAVITIES = 100

/** Bounds of the fibrous inputs (sanity bounds that keep absurd numbers out). */
export const FIBROUS_LIMITS = {
  surfaceAreaM2: { min: 0, max: 100, unit: 'm²', minExclusive: true },
  shellThicknessMm: { min: 0, max: 100, unit: 'mm', minExclusive: true },
  cavities: { min: 1, max: MAX_CAVITIES, unit: 'cavities' },
  quantityPerCast: { min: 0, max: 10000, unit: 'per cast', minExclusive: true },
  kgPerUnit: { min: 0, max: 1000, unit: 'kg per unit' },
} as const

/** What the model needs of a mould to know one pour. */
export interface MouldCast {
  castType: CastType
  /** cavity volume of one piece, L (solid); unused for a fibrous cast */
  cavityLitres: number
  cavities: number
  surfaceAreaM2?: number | null
  shellThicknessMm?: number | null
}

function cavitiesOf(m: MouldCast): number {
  const n = assertPlasterNumber(m.cavities, 'cavities', FIBROUS_LIMITS.cavities)
  if (!Number.isInteger(n)) throw new PlasterInputError('cavities', 'cavities must be a whole number')
  return n
}

/** Plaster shell of a fibrous cast, L: area (m²) × thickness (mm); 1 m² × 1 mm = 1 L. */
export function shellLitres(input: { surfaceAreaM2: number; shellThicknessMm: number }): number {
  const i = assertPlasterObject(input, 'input')
  const area = assertPlasterNumber(i.surfaceAreaM2, 'surfaceAreaM2', FIBROUS_LIMITS.surfaceAreaM2)
  const mm = assertPlasterNumber(i.shellThicknessMm, 'shellThicknessMm', FIBROUS_LIMITS.shellThicknessMm)
  return area * mm
}

/** Slurry one piece takes, L (no waste): the cavity (solid) or the shell (fibrous). */
export function pieceLitres(m: MouldCast): number {
  assertPlasterObject(m, 'mould')
  if (m.castType === 'fibrous') {
    if (m.surfaceAreaM2 == null) throw new PlasterInputError('surfaceAreaM2', 'surfaceAreaM2 is required for a fibrous cast')
    if (m.shellThicknessMm == null) throw new PlasterInputError('shellThicknessMm', 'shellThicknessMm is required for a fibrous cast')
    return shellLitres({ surfaceAreaM2: m.surfaceAreaM2, shellThicknessMm: m.shellThicknessMm })
  }
  if (m.castType !== 'solid') throw new PlasterInputError('castType', 'castType must be solid or fibrous')
  return assertPlasterNumber(m.cavityLitres, 'cavityLitres', PLASTER_LIMITS.cavityLitres)
}

/** Slurry one pour takes, L (no waste): every cavity filled at once. */
export function pourLitres(m: MouldCast): number {
  return pieceLitres(m) * cavitiesOf(m)
}

/** How many pieces one pour makes. */
export function piecesPerPour(m: Pick<MouldCast, 'cavities'>): number {
  return cavitiesOf(m as MouldCast)
}

/** Each piece's share of a pour's batch: 1 / cavities (the cavities of one mould are identical). */
export function pieceShareOfPour(m: Pick<MouldCast, 'cavities'>): number {
  return 1 / piecesPerPour(m)
}

/** Pours needed for `pieces` pieces: whole pours, ⌈pieces / cavities⌉. */
export function poursForPieces(pieces: number, m: Pick<MouldCast, 'cavities'>): number {
  if (!Number.isInteger(pieces) || pieces < 0) throw new PlasterInputError('pieces', 'pieces must be a whole number, 0 or more')
  return Math.ceil(pieces / piecesPerPour(m))
}

/** The section a piece dries through, mm: its shell (fibrous) or the model's usual solid section. */
export function dryingThicknessMm(m: Pick<MouldCast, 'castType' | 'shellThicknessMm'>): number {
  return m.castType === 'fibrous' && m.shellThicknessMm ? m.shellThicknessMm : PLASTER_CAST_THICKNESS_MM
}

/** One line of a mould's consumables list. */
export interface CastConsumable {
  consumableId: number | string
  name: string
  unit: ConsumableUnit
  quantityPerCast: number
  kgPerUnit?: number | null
}

export const CONSUMABLE_UNITS = ['m2', 'm', 'each'] as const
export type ConsumableUnit = typeof CONSUMABLE_UNITS[number]

/** What one pour uses of each consumable: quantity per cast × cavities. */
export function consumablesForPour<T extends CastConsumable>(list: readonly T[], m: Pick<MouldCast, 'cavities'>): (T & { quantity: number })[] {
  const n = piecesPerPour(m)
  return list.map((c, i) => {
    const q = assertPlasterNumber(c.quantityPerCast, `consumables[${i}].quantityPerCast`, FIBROUS_LIMITS.quantityPerCast)
    return { ...c, quantity: q * n }
  })
}

/** kg one piece carries in consumables (lines with no known mass per unit add nothing). */
export function consumablesKgPerPiece(list: readonly CastConsumable[]): number {
  return list.reduce((kg, c) => kg + (c.kgPerUnit ?? 0) * c.quantityPerCast, 0)
}

/** Scrim for a face, m²: area × layers × (1 + laps %), the form's suggestion (usual figures above). */
export function suggestedScrimM2(input: { surfaceAreaM2: number; layers?: number; lapPct?: number }): number {
  const i = assertPlasterObject(input, 'input')
  const area = assertPlasterNumber(i.surfaceAreaM2, 'surfaceAreaM2', FIBROUS_LIMITS.surfaceAreaM2)
  const layers = assertPlasterNumber(i.layers ?? SCRIM_LAYERS_USUAL, 'layers', { min: 1, max: 10, unit: 'layers' })
  const lap = assertPlasterNumber(i.lapPct ?? SCRIM_LAP_PCT_USUAL, 'lapPct', PLASTER_LIMITS.wastePct)
  return area * layers * (1 + lap / 100)
}

/**
 * One piece of a pour: its share of the cast's plaster masses plus the consumables it carries.
 * `cast` is the whole pour's set cast (castFromBatch of the batch less its waste).
 */
export function pieceMasses(input: { cast: { dryMassKg: number; wetMassKg: number }; mould: Pick<MouldCast, 'cavities'>; consumables?: readonly CastConsumable[] }) {
  const share = pieceShareOfPour(input.mould)
  const carried = consumablesKgPerPiece(input.consumables ?? [])
  return { dryMassKg: input.cast.dryMassKg * share + carried, wetMassKg: input.cast.wetMassKg * share + carried }
}

/** A moulds row's cast columns as the model takes them (NUMERIC arrives as a number or text). */
export function mouldCastFromRow(r: { cast_type?: string | null; cavity_litres: number | string; cavities?: number | string | null; surface_area_m2?: number | string | null; shell_thickness_mm?: number | string | null }): MouldCast {
  const num = (v: number | string | null | undefined) => (v === null || v === undefined ? null : Number(v))
  return {
    castType: r.cast_type === 'fibrous' ? 'fibrous' : 'solid',
    cavityLitres: Number(r.cavity_litres),
    cavities: num(r.cavities) ?? 1,
    surfaceAreaM2: num(r.surface_area_m2),
    shellThicknessMm: num(r.shell_thickness_mm),
  }
}
