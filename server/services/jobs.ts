// Jobs: the detail each role may see, items through the run calculator, client members and
// the sample approval round (lead marks it ready, the client decides; both recorded and mailed).
import type { Knex } from 'knex'
import { profilesRepo } from '../repos/profiles'
import type { Actor } from '../utils/auth'
import { jobsRepo, type JobInput, type JobListRow, type JobRow } from '../repos/jobs'
import { jobItemsRepo, type ItemColumns, type ItemListRow, type ItemRow } from '../repos/job-items'
import { gradesRepo, type GradeRow } from '../repos/plaster-grades'
import { mouldsRepo } from '../repos/moulds'
import { usersRepo } from '../repos/users'
import { clientOrgsRepo } from '../repos/client-orgs'
import { clientSitesRepo } from '../repos/client-sites'
import { clientContactsRepo } from '../repos/client-contacts'
import { inviteUser } from './accounts'
import { PlasterInputError } from '#shared/utils/plaster-core'
import type { JobItemCreateInput } from '#shared/utils/job-schemas'
import type { ClientJobDetail, ClientJobSummary, ItemPlanView, Job, JobDetail, JobItem, JobListEntry, JobMemberResult, PlannedJobItem } from '#shared/types/jobs'

const isoOrNull = (d: Date | null): string | null => (d ? d.toISOString() : null)

export function toJob(r: JobRow): Job {
  return {
    id: r.id, code: r.code, title: r.title, site: r.site, dueOn: r.due_on, notes: r.notes, state: r.state,
    sampleRequired: r.sample_required, sampleState: r.sample_state, sampleComment: r.sample_comment,
    sampleDecidedBy: r.sample_decided_by, sampleDecidedAt: isoOrNull(r.sample_decided_at), version: r.version,
    clientOrgId: r.client_org_id, siteId: r.site_id,
  }
}

const toJobListEntry = (r: JobListRow): JobListEntry => ({ ...toJob(r), itemCount: r.item_count, memberCount: r.member_count })

export function toJobItem(r: ItemRow): JobItem {
  return {
    id: r.id, jobId: r.job_id, mouldId: r.mould_id, profile: r.profile, description: r.description, quantity: r.quantity,
    runM: r.run_m, walls: r.walls, minPieceM: r.min_piece_m, sparesPct: r.spares_pct, piecesNeeded: r.pieces_needed,
    projectionM: r.projection_m, sawCutM: r.saw_cut_m, cornerBlockLegM: r.corner_block_leg_m,
    gradeId: r.grade_id, consistency: r.consistency, sortOrder: r.sort_order, version: r.version,
  }
}

export async function listJobs(workshopId: number): Promise<JobListEntry[]> {
  return (await jobsRepo.list(useDb(), workshopId)).map(toJobListEntry)
}

/**
 * The job's client and site must be this workshop's, and the site that client's. A site alone
 * brings its client; a new client without a site clears a site of the old client. A site chosen
 * without site text names the job's site text after it (the client's pages show that text).
 */
async function clientAndSite(db: Knex, workshopId: number, input: JobInput, current?: JobRow): Promise<JobInput> {
  const out = { ...input }
  if (out.clientOrgId && !(await clientOrgsRepo.exists(db, workshopId, out.clientOrgId))) unprocessable([{ field: 'clientOrgId', message: 'clientOrgId is not a client of this workshop' }])
  if (out.siteId) {
    const site = await clientSitesRepo.byId(db, workshopId, out.siteId)
    if (!site) unprocessable([{ field: 'siteId', message: 'siteId is not a site of this workshop' }])
    const orgId = out.clientOrgId !== undefined ? out.clientOrgId : current?.client_org_id
    if (orgId && orgId !== site.client_org_id) unprocessable([{ field: 'siteId', message: 'siteId is not a site of this client' }])
    out.clientOrgId = site.client_org_id
    if (out.site === undefined && !current?.site) out.site = site.name
  }
  else if (out.siteId === undefined && out.clientOrgId !== undefined && current?.site_id) {
    const site = await clientSitesRepo.byId(db, workshopId, current.site_id)
    if (site && site.client_org_id !== out.clientOrgId) out.siteId = null
  }
  return out
}

export async function createJob(workshopId: number, input: JobInput): Promise<Job> {
  const db = useDb()
  return toJob(await jobsRepo.insert(db, workshopId, await clientAndSite(db, workshopId, input)))
}

/** Turning the sample requirement on or off moves the sample state to "to be cast" or "not required" unless the client has decided. */
export async function updateJob(workshopId: number, id: number, version: number, input: JobInput): Promise<Job> {
  const db = useDb()
  const job = await jobsRepo.byId(db, workshopId, id)
  if (!job) notFound('Job')
  let sampleState: string | undefined
  if (input.sampleRequired === true && job.sample_state === 'not_required') sampleState = 'awaiting_cast'
  if (input.sampleRequired === false && job.sample_state !== 'approved') sampleState = 'not_required'
  return toJob(await jobsRepo.update(db, workshopId, id, version, { ...(await clientAndSite(db, workshopId, input, job)), sampleState }))
}

/** The client's own jobs (member of), with item counts; nothing internal. */
export async function clientJobs(actor: Actor): Promise<ClientJobSummary[]> {
  return (await jobsRepo.forClient(useDb(), actor.workshopId, actor.id)).map(r => ({
    id: r.id, code: r.code, title: r.title, site: r.site, dueOn: r.due_on, state: r.state, sampleState: r.sample_state, itemCount: r.item_count,
  }))
}

/**
 * The item's plan: pieces (with the cut list for a run) and plaster in kg and bags when the mould
 * and grade are known. A plan the model refuses (say the mould's cast length was edited so a wall
 * no longer cuts) is shown as missing rather than failing the whole job.
 */
function itemPlan(item: ItemListRow, grades: Map<number, GradeRow>): ItemPlanView {
  const grade = item.grade_id ? grades.get(item.grade_id) : undefined
  const run = item.walls && item.cast_length_m
    ? { walls: item.walls, castLengthM: item.cast_length_m, minPieceM: item.min_piece_m ?? DEFAULT_MIN_PIECE_M, sparesPct: item.spares_pct, ...runCorners(item) }
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

/** The job's items with their plans (the lead's page). */
async function plannedItems(db: Knex, workshopId: number, id: number): Promise<PlannedJobItem[]> {
  const [items, grades] = await Promise.all([jobItemsRepo.forJob(db, workshopId, id), gradesRepo.list(db, workshopId)])
  const byId = new Map(grades.map(g => [g.id, g]))
  return items.map(i => ({
    ...toJobItem(i), mouldCode: i.mould_code, cavityLitres: i.cavity_litres, castLengthM: i.cast_length_m, gradeName: i.grade_name,
    plan: itemPlan(i, byId),
  }))
}

/** One job for staff: everything, with item plans and client members. */
export async function jobDetail(actor: Actor, id: number): Promise<JobDetail> {
  const db = useDb()
  const job = await jobsRepo.byId(db, actor.workshopId, id)
  if (!job) notFound('Job')
  const [items, members] = await Promise.all([plannedItems(db, actor.workshopId, id), jobsRepo.members(db, actor.workshopId, id)])
  return { ...toJob(job), released: jobReleased(job), items, members }
}

/** One job as a client member sees it: never notes or other internal fields. */
export async function clientJobDetail(actor: Actor, id: number): Promise<ClientJobDetail> {
  const db = useDb()
  const job = await jobsRepo.byId(db, actor.workshopId, id)
  // a client who is not a member gets the same 404 as for a job that does not exist
  if (!job || !(await jobsRepo.isMember(db, actor.workshopId, id, actor.id))) notFound('Job')
  const items = await jobItemsRepo.forJob(db, actor.workshopId, id)
  return {
    id: job.id, code: job.code, title: job.title, site: job.site, dueOn: job.due_on, state: job.state,
    sampleRequired: job.sample_required, sampleState: job.sample_state, sampleComment: job.sample_comment,
    sampleDecidedAt: isoOrNull(job.sample_decided_at), released: jobReleased(job),
    items: items.map(i => ({ id: i.id, description: i.description, profile: i.profile, mouldCode: i.mould_code, quantity: i.quantity, runM: i.run_m, piecesNeeded: i.pieces_needed })),
  }
}

/** The run calculator's corner figures an item stored (absent when not given). */
function runCorners(r: { projection_m: number | null; saw_cut_m: number | null; corner_block_leg_m: number | null }) {
  return {
    ...(r.projection_m === null ? {} : { projectionM: Number(r.projection_m) }),
    ...(r.saw_cut_m === null ? {} : { sawCutM: Number(r.saw_cut_m) }),
    ...(r.corner_block_leg_m === null ? {} : { cornerBlockLegM: Number(r.corner_block_leg_m) }),
  }
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
  const corners = { projection_m: isRun ? input.projectionM ?? null : null, saw_cut_m: isRun ? input.sawCutM ?? null : null, corner_block_leg_m: isRun ? input.cornerBlockLegM ?? null : null }
  // a run the model refuses (a wall shorter than the shortest piece) is the usual 422 (asHttpError)
  const pieces = itemPiecesNeeded(isRun
    ? { run: { walls: input.walls!, castLengthM: mould!.cast_length_m!, minPieceM, sparesPct, ...runCorners(corners) } }
    : { quantity: input.quantity! }).pieces
  return {
    mould_id: input.mouldId ?? null, profile: input.profile ?? null, description: input.description,
    // the item's profile in words, linked when the workshop has it (the planner also matches by name)
    profile_id: input.profile ? await profilesRepo.find(db, workshopId, input.profile) : null,
    quantity: isRun ? null : input.quantity!, run_m: isRun ? input.walls!.reduce((m, w) => m + w.lengthM, 0) : null,
    walls: isRun ? JSON.stringify(input.walls) : null, min_piece_m: isRun ? minPieceM : null, spares_pct: isRun ? sparesPct : 0, ...corners,
    pieces_needed: pieces, grade_id: input.gradeId ?? null,
    consistency: input.consistency ?? grade?.consistency_default ?? null, sort_order: input.sortOrder ?? 0,
  }
}

export async function addItem(actor: Actor, jobId: number, input: JobItemCreateInput): Promise<JobItem> {
  const db = useDb()
  if (!(await jobsRepo.byId(db, actor.workshopId, jobId))) notFound('Job')
  return toJobItem(await jobItemsRepo.insert(db, actor.workshopId, jobId, await itemColumns(db, actor.workshopId, input)))
}

export async function updateItem(actor: Actor, jobId: number, id: number, input: JobItemCreateInput & { version: number }): Promise<JobItem> {
  const db = useDb()
  if (!(await jobItemsRepo.byId(db, actor.workshopId, jobId, id))) notFound('Item')
  const row = await jobItemsRepo.update(db, actor.workshopId, jobId, id, input.version, await itemColumns(db, actor.workshopId, input))
  if (!row) conflict('This item was changed by someone else; reload and try again')
  return toJobItem(row)
}

export async function removeItem(actor: Actor, jobId: number, id: number) {
  const db = useDb()
  if (!(await jobItemsRepo.byId(db, actor.workshopId, jobId, id))) notFound('Item')
  if (await jobItemsRepo.hasPours(db, actor.workshopId, id)) conflict('This item already has pours on the board; void them first')
  await jobItemsRepo.remove(db, actor.workshopId, jobId, id)
}

/** Adds an existing client of the workshop to the job, or invites a new one by e-mail into it. */
export async function addClientMember(actor: Actor, jobId: number, input: { email: string; name?: string | null }): Promise<JobMemberResult> {
  const db = useDb()
  const job = await jobsRepo.byId(db, actor.workshopId, jobId)
  if (!job) notFound('Job')
  const existing = await usersRepo.byEmail(db, input.email)
  const orgId = job.client_org_id
  if (existing) {
    if (existing.workshop_id !== actor.workshopId || existing.role !== 'client') conflict('This e-mail belongs to someone who is not a client of this workshop')
    await jobsRepo.addMember(db, actor.workshopId, jobId, existing.id)
    // a member of the job's client gets its job mail like the client's other contacts
    if (orgId && existing.client_org_id === orgId) await clientContactsRepo.ensure(db, actor.workshopId, orgId, { name: existing.name, email: existing.email })
    return { status: 'added', email: input.email }
  }
  await inviteUser(actor, { email: input.email, role: 'client', name: input.name ?? undefined, jobId, clientOrgId: orgId ?? undefined })
  if (orgId) await clientContactsRepo.ensure(db, actor.workshopId, orgId, { name: input.name ?? input.email, email: input.email })
  return { status: 'invited', email: input.email }
}
