// Jobs: the detail each role may see, items through the run calculator, client members and
// the sample approval round (lead marks it ready, the client decides; both recorded and mailed).
import type { Knex } from 'knex'
import type { Actor } from '../utils/auth'
import { CLIENT_JOB_COLUMNS, jobsRepo, type JobRow } from '../repos/jobs'
import { jobItemsRepo, type ItemColumns, type ItemRow } from '../repos/job-items'
import { gradesRepo, type GradeRow } from '../repos/plaster-grades'
import { mouldsRepo } from '../repos/moulds'
import { usersRepo } from '../repos/users'
import { inviteUser } from './accounts'
import { PlasterInputError } from '#shared/utils/plaster-core'
import type { JobItemCreateInput } from '#shared/utils/job-schemas'

/**
 * The item's plan: pieces (with the cut list for a run) and plaster in kg and bags when the mould
 * and grade are known. A plan the model refuses (say the mould's cast length was edited so a wall
 * no longer cuts) is shown as missing rather than failing the whole job.
 */
function itemPlan(item: ItemRow, grades: Map<number, GradeRow>) {
  const grade = item.grade_id ? grades.get(item.grade_id) : undefined
  const run = item.walls && item.cast_length_m
    ? { walls: item.walls, castLengthM: item.cast_length_m, minPieceM: item.min_piece_m ?? DEFAULT_MIN_PIECE_M, sparesPct: item.spares_pct }
    : null
  const attempt = <T>(fn: () => T): T | null => {
    try {
      return fn()
    }
    catch (err) {
      if (err instanceof PlasterInputError) return null
      throw err
    }
  }
  const cutList = run ? attempt(() => itemPiecesNeeded({ run }).cutList) : null
  const plaster = grade && item.cavity_litres
    ? attempt(() => itemPlaster({ pieces: item.pieces_needed, cavityLitres: item.cavity_litres!, consistency: item.consistency ?? grade.consistency_default, grade: plasterGradeFromRow(grade), bagKg: grade.bag_kg }))
    : null
  return { cutList, plaster, bagKg: grade?.bag_kg ?? null }
}

async function loadJobForActor(db: Knex, actor: Actor, id: number): Promise<JobRow> {
  const job = await jobsRepo.byId(db, actor.workshopId, id)
  // a client who is not a member gets the same 404 as for a job that does not exist
  if (!job || (actor.role === 'client' && !(await jobsRepo.isMember(db, actor.workshopId, id, actor.id)))) notFound('Job')
  return job
}

export async function jobDetail(actor: Actor, id: number) {
  const db = useDb()
  const job = await loadJobForActor(db, actor, id)
  const [items, grades] = await Promise.all([jobItemsRepo.forJob(db, actor.workshopId, id), gradesRepo.list(db, actor.workshopId)])
  const byId = new Map(grades.map(g => [g.id, g]))
  const planned = items.map(i => ({ ...i, plan: itemPlan(i, byId) }))
  if (actor.role === 'client') {
    const visible = Object.fromEntries(CLIENT_JOB_COLUMNS.map(c => [c, job[c as keyof JobRow]]))
    return {
      ...visible, released: jobReleased(job),
      items: planned.map(i => ({ id: i.id, description: i.description, profile: i.profile, mould_code: i.mould_code, quantity: i.quantity, run_m: i.run_m, pieces_needed: i.pieces_needed })),
    }
  }
  const members = await jobsRepo.members(db, actor.workshopId, id)
  return { ...job, released: jobReleased(job), items: planned, members }
}

function asItemError(err: unknown): never {
  if (err instanceof PlasterInputError) unprocessable([{ field: err.field.replace(/\[(\d+)\]/g, '.$1'), message: err.message }])
  throw err
}

/** Checks the item's mould and grade belong to the workshop, then works out pieces and run length. */
async function itemColumns(db: Knex, workshopId: number, input: JobItemCreateInput): Promise<ItemColumns> {
  const mould = input.mouldId ? await mouldsRepo.byId(db, workshopId, input.mouldId) : null
  if (input.mouldId && !mould) unprocessable([{ field: 'mouldId', message: 'is not a mould of this workshop' }])
  const grade = input.gradeId ? await gradesRepo.byId(db, workshopId, input.gradeId) : null
  if (input.gradeId && !grade) unprocessable([{ field: 'gradeId', message: 'is not a plaster grade of this workshop' }])
  const isRun = input.kind === 'run'
  if (isRun && !mould?.cast_length_m) unprocessable([{ field: 'mouldId', message: 'mouldId must be a run mould with a cast length' }])
  const minPieceM = input.minPieceM ?? DEFAULT_MIN_PIECE_M
  const sparesPct = input.sparesPct ?? 0
  let pieces: number
  try {
    pieces = itemPiecesNeeded(isRun
      ? { run: { walls: input.walls!, castLengthM: mould!.cast_length_m!, minPieceM, sparesPct } }
      : { quantity: input.quantity! }).pieces
  }
  catch (err) {
    asItemError(err)
  }
  return {
    mould_id: input.mouldId ?? null, profile: input.profile ?? null, description: input.description,
    quantity: isRun ? null : input.quantity!, run_m: isRun ? input.walls!.reduce((m, w) => m + w.lengthM, 0) : null,
    walls: isRun ? JSON.stringify(input.walls) : null, min_piece_m: isRun ? minPieceM : null, spares_pct: isRun ? sparesPct : 0,
    pieces_needed: pieces, grade_id: input.gradeId ?? null,
    consistency: input.consistency ?? grade?.consistency_default ?? null, sort_order: input.sortOrder ?? 0,
  }
}

export async function addItem(actor: Actor, jobId: number, input: JobItemCreateInput) {
  const db = useDb()
  if (!(await jobsRepo.byId(db, actor.workshopId, jobId))) notFound('Job')
  return jobItemsRepo.insert(db, actor.workshopId, jobId, await itemColumns(db, actor.workshopId, input))
}

export async function updateItem(actor: Actor, jobId: number, id: number, input: JobItemCreateInput & { version: number }) {
  const db = useDb()
  if (!(await jobItemsRepo.byId(db, actor.workshopId, jobId, id))) notFound('Item')
  const row = await jobItemsRepo.update(db, actor.workshopId, jobId, id, input.version, await itemColumns(db, actor.workshopId, input))
  if (!row) conflict('This item was changed by someone else; reload and try again')
  return row
}

export async function removeItem(actor: Actor, jobId: number, id: number) {
  const db = useDb()
  if (!(await jobItemsRepo.byId(db, actor.workshopId, jobId, id))) notFound('Item')
  if (await jobItemsRepo.hasPours(db, actor.workshopId, id)) conflict('This item already has pours on the board; void them first')
  await jobItemsRepo.remove(db, actor.workshopId, jobId, id)
}

/** Adds an existing client of the workshop to the job, or invites a new one by e-mail into it. */
export async function addClientMember(actor: Actor, jobId: number, input: { email: string; name?: string | null }) {
  const db = useDb()
  if (!(await jobsRepo.byId(db, actor.workshopId, jobId))) notFound('Job')
  const existing = await usersRepo.byEmail(db, input.email)
  if (existing) {
    if (existing.workshop_id !== actor.workshopId || existing.role !== 'client') conflict('This e-mail belongs to someone who is not a client of this workshop')
    await jobsRepo.addMember(db, actor.workshopId, jobId, existing.id)
    return { status: 'added' as const, email: input.email }
  }
  await inviteUser(actor, { email: input.email, role: 'client', name: input.name ?? undefined, jobId })
  return { status: 'invited' as const, email: input.email }
}
