// What the catalogue routes send (camelCase on the wire): plaster grades, lots, benches, moulds.
import type { LotStock, MouldLife } from '../utils/catalogue'
import type { PlasterGrade } from '../utils/plaster-core'
import type { CastType, ConsumableUnit } from '../utils/plaster-fibrous'

/** A plaster grade as GET /api/grades lists it and POST / PATCH /api/grades answer: the
 *  plaster model's values (`plaster`), the shop's bag mass and the register's calibration. */
export interface Grade {
  id: number
  name: string
  presetKey: string | null
  plaster: PlasterGrade
  bagKg: number
  calibration: GradeCalibration
  notes: string | null
  archivedAt: string | null
  version: number
}

/**
 * A grade's demould calibration: the live factor over the attended demoulds (`count`, with
 * `excluded` early or late ones left out) and the factor a lead applied (`appliedFactor` from
 * `appliedCount` pours), which is the one the board, planner and mix card use.
 */
export interface GradeCalibration {
  factor: number | null
  count: number
  excluded: number
  applied: boolean
  appliedFactor: number | null
  appliedCount: number
}

/** A lot as POST / PATCH /api/lots answer. */
export interface Lot {
  id: number
  gradeId: number
  lotCode: string
  bagsReceived: number
  bagKg: number
  receivedOn: string
  useBy: string | null
  notes: string | null
  /** what a bag cost, in the workshop currency's minor unit; null when not known */
  pricePerBag: number | null
  archivedAt: string | null
  version: number
}
/** A lot as GET /api/lots lists it: with its grade's name and the stock on hand. */
export type LotWithStock = Lot & { gradeName: string; stock: LotStock }

/** A bench as GET /api/benches lists it and POST / PATCH /api/benches answer. */
export interface Bench {
  id: number
  name: string
  kind: string
  lengthM: number | null
  sortOrder: number
  archivedAt: string | null
  version: number
  /** mixes gauged on the bench at once; null: no limit */
  maxMixes: number | null
}

/** A mould as GET /api/moulds lists it and POST / PATCH /api/moulds and the state change answer,
 *  with its bench, who last changed its state and its life warning. */
export interface Mould {
  id: number
  benchId: number | null
  benchName: string | null
  code: string
  casts: string
  material: string
  cavityLitres: number
  castLengthM: number | null
  prepMinutes: number
  cleanMinutes: number
  maxDwellMinutes: number
  pulls: number
  expectedPulls: number | null
  state: string
  stateChangedBy: number | null
  stateChangedByName: string | null
  stateChangedAt: string | null
  stateReason: string | null
  version: number
  life: MouldLife
  /** the profile it casts: the planner may use any ready mould of an item's profile */
  profile: string | null
  /** pieces one pour makes */
  cavities: number
  /** solid fills the cavity; fibrous lays a shell over the face (plaster-fibrous.ts) */
  castType: CastType
  surfaceAreaM2: number | null
  shellThicknessMm: number | null
  /** what one cast uses of the workshop's consumables */
  consumables: MouldConsumable[]
}

/** A line of a mould's consumables list. */
export interface MouldConsumable {
  consumableId: number
  name: string
  unit: ConsumableUnit
  quantityPerCast: number
  kgPerUnit: number | null
}

/** A consumable as GET /api/consumables lists it, with its stock on hand in its unit. */
export interface Consumable {
  id: number
  name: string
  unit: ConsumableUnit
  kgPerUnit: number | null
  onHand: number
  archivedAt: string | null
  version: number
}

/** A profile as GET /api/profiles lists it: how many moulds cast it, how many are ready. */
export interface Profile {
  id: number
  name: string
  moulds: number
  readyMoulds: number
}

/** A pour in a mould's history, newest first. */
export interface MouldPour {
  id: number
  state: string
  mixAt: string
  demouldedAt: string | null
  result: string | null
  defect: string | null
  isSample: boolean
  consistency: number | null
  jobCode: string | null
  item: string | null
  caster: string | null
  lotCode: string | null
}

/** A register entry about the mould (state changes carry from, to and reason). */
export interface MouldEvent {
  id: number
  type: string
  at: string
  actor: string | null
  data: { from?: string; to?: string; reason?: string | null }
}

/** GET /api/moulds/[id]: the mould with its pours and register entries. */
export type MouldDetail = Mould & { pours: MouldPour[]; events: MouldEvent[] }
