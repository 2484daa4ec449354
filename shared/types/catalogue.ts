// Rows the catalogue and job routes return (snake_case, as the database names them), used by
// the repos and by the pages.
import type { LotStock, MouldLife } from '../utils/catalogue'
import type { PlasterRunCutList } from '../utils/plaster-cutlist'

export interface GradeRow {
  id: number
  name: string
  preset_key: string | null
  form: 'beta' | 'alpha'
  powder_density: number
  consistency_min: number
  consistency_max: number
  consistency_default: number
  demould_minutes_ref: number
  set_time_water_exponent: number
  temperature_factors: [number, number][]
  hydration_heat: number
  set_expansion_pct: number
  purity: number
  bag_kg: number
  calibration_factor: number | null
  calibration_count: number
  calibration_applied: boolean
  notes: string | null
  archived_at: string | null
  version: number
}

export interface LotRow {
  id: number
  grade_id: number
  grade_name: string
  lot_code: string
  bags_received: number
  bag_kg: number
  received_on: string
  use_by: string | null
  notes: string | null
  archived_at: string | null
  version: number
}
export type LotWithStock = LotRow & { stock: LotStock }

export interface BenchRow {
  id: number
  name: string
  kind: string
  length_m: number | null
  sort_order: number
  archived_at: string | null
  version: number
}

export interface MouldRow {
  id: number
  bench_id: number | null
  bench_name?: string | null
  code: string
  casts: string
  material: string
  cavity_litres: number
  cast_length_m: number | null
  prep_minutes: number
  clean_minutes: number
  max_dwell_minutes: number
  pulls: number
  expected_pulls: number | null
  state: string
  state_changed_by: number | null
  state_changed_by_name?: string | null
  state_changed_at: string | null
  state_reason: string | null
  version: number
}
export type MouldWithLife = MouldRow & { life: MouldLife }

export interface JobRow {
  id: number
  code: string
  title: string
  site: string | null
  due_on: string | null
  notes: string | null
  state: string
  sample_required: boolean
  sample_state: string
  sample_comment: string | null
  sample_decided_by: number | null
  sample_decided_at: string | null
  version: number
}

export interface ItemRow {
  id: number
  job_id: number
  mould_id: number | null
  profile: string | null
  description: string
  quantity: number | null
  run_m: number | null
  walls: { lengthM: number }[] | null
  min_piece_m: number | null
  spares_pct: number
  pieces_needed: number
  grade_id: number | null
  consistency: number | null
  sort_order: number
  version: number
  mould_code?: string | null
  cavity_litres?: number | null
  cast_length_m?: number | null
  grade_name?: string | null
}

export interface ItemPlanView {
  cutList: PlasterRunCutList | null
  plaster: { perPieceKg: number; plasterKg: number; waterKg: number; bags: number } | null
  bagKg: number | null
}

export type JobDetail = JobRow & {
  released: boolean
  items: (ItemRow & { plan: ItemPlanView })[]
  members: { id: number; name: string; email: string }[]
}

export interface ClientJobDetail {
  id: number
  code: string
  title: string
  site: string | null
  due_on: string | null
  state: string
  sample_required: boolean
  sample_state: string
  sample_comment: string | null
  sample_decided_at: string | null
  released: boolean
  items: { id: number; description: string; profile: string | null; mould_code: string | null; quantity: number | null; run_m: number | null; pieces_needed: number }[]
}
