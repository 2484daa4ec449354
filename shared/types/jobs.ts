// What the job routes send (camelCase on the wire): the lead's job and its items, the client's
// view of a job (never notes or other internal fields) and the client's job list.
import type { PlasterRunCutList, PlasterRunWall } from '../utils/plaster-cutlist'

/** A job as POST / PATCH /api/jobs and the sample mark answer. */
export interface Job {
  id: number
  code: string
  title: string
  site: string | null
  dueOn: string | null
  notes: string | null
  state: string
  sampleRequired: boolean
  sampleState: string
  sampleComment: string | null
  sampleDecidedBy: number | null
  sampleDecidedAt: string | null
  version: number
  /** the client organisation and its site the job is for */
  clientOrgId: number | null
  siteId: number | null
}

/** GET /api/jobs: every job of the workshop with its counts. */
export type JobListEntry = Job & { itemCount: number; memberCount: number }

/** A job item as POST / PATCH /api/jobs/[id]/items answer. */
export interface JobItem {
  id: number
  jobId: number
  mouldId: number | null
  profile: string | null
  description: string
  quantity: number | null
  runM: number | null
  /** each wall's length and how its two ends finish (square, internal, external, return) */
  walls: PlasterRunWall[] | null
  minPieceM: number | null
  sparesPct: number
  /** the run calculator's corner figures, m (null: not given) */
  projectionM: number | null
  sawCutM: number | null
  cornerBlockLegM: number | null
  piecesNeeded: number
  gradeId: number | null
  consistency: number | null
  sortOrder: number
  version: number
}

/** An item's plan: the cut list of a run, and plaster in kg and bags when mould and grade are known. */
export interface ItemPlanView {
  cutList: PlasterRunCutList | null
  plaster: { perPieceKg: number; plasterKg: number; waterKg: number; bags: number } | null
  bagKg: number | null
}

/** An item on the lead's job page: with its mould and grade and its plan. */
export type PlannedJobItem = JobItem & {
  mouldCode: string | null
  cavityLitres: number | null
  castLengthM: number | null
  gradeName: string | null
  plan: ItemPlanView
}

export interface JobMember { id: number; name: string; email: string }

/** GET /api/jobs/[id] (staff): the job, whether it is released to the board, items and client members. */
export type JobDetail = Job & { released: boolean; items: PlannedJobItem[]; members: JobMember[] }

/** PUT a client on a job: added when they have an account, else invited. */
export interface JobMemberResult { status: 'added' | 'invited'; email: string }

/** POST /api/jobs/[id]/sample-decision: the client's decision as recorded. */
export interface SampleDecisionResult {
  id: number
  sampleState: string
  sampleComment: string | null
  sampleDecidedAt: string | null
  released: boolean
}

/** GET /api/client/jobs: the client's own jobs. */
export interface ClientJobSummary {
  id: number
  code: string
  title: string
  site: string | null
  dueOn: string | null
  state: string
  sampleState: string
  itemCount: number
}

/** GET /api/client/jobs/[id]: what a client member sees of a job. */
export interface ClientJobDetail extends Omit<ClientJobSummary, 'itemCount'> {
  sampleRequired: boolean
  sampleComment: string | null
  sampleDecidedAt: string | null
  released: boolean
  items: { id: number; description: string; profile: string | null; mouldCode: string | null; quantity: number | null; runM: number | null; piecesNeeded: number }[]
}
