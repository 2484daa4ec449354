// Every knex call for jobs and job_members.
import type { Knex } from 'knex'
import { UNIQUE_LABELS, updateVersioned } from './versioned'

/** A jobs row as JOB_COLUMNS read it (DATE as 'YYYY-MM-DD': server/utils/db.ts). */
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
  sample_decided_at: Date | null
  version: number
  created_at: Date
  client_org_id: number | null
  site_id: number | null
}
export type JobListRow = JobRow & { item_count: number; member_count: number }
export interface ClientJobRow {
  id: number
  code: string
  title: string
  site: string | null
  due_on: string | null
  state: string
  sample_state: string
  item_count: number
}
export interface JobMemberRow { id: number; name: string; email: string }

export const JOB_COLUMNS = ['id', 'code', 'title', 'site', 'due_on', 'notes', 'state', 'sample_required', 'sample_state',
  'sample_comment', 'sample_decided_by', 'sample_decided_at', 'version', 'created_at', 'client_org_id', 'site_id'] as const

export interface JobInput {
  code?: string
  title?: string
  site?: string | null
  dueOn?: string | null
  notes?: string | null
  state?: string
  sampleRequired?: boolean
  clientOrgId?: number | null
  siteId?: number | null
}

function toColumns(i: JobInput) {
  const map: [keyof JobInput, string][] = [['code', 'code'], ['title', 'title'], ['site', 'site'], ['dueOn', 'due_on'],
    ['notes', 'notes'], ['state', 'state'], ['sampleRequired', 'sample_required'], ['clientOrgId', 'client_org_id'], ['siteId', 'site_id']]
  return Object.fromEntries(map.filter(([k]) => i[k] !== undefined).map(([k, c]) => [c, i[k]]))
}

const itemCount = 'SELECT count(*)::int FROM job_items i WHERE i.job_id = j.id AND i.workshop_id = j.workshop_id'

export const jobsRepo = {
  /** Jobs a client user is a member of, in their workshop only. */
  forClient(db: Knex, workshopId: number, userId: number): Promise<ClientJobRow[]> {
    return db('jobs as j')
      .join('job_members as m', function () {
        this.on('m.job_id', 'j.id').andOn('m.workshop_id', 'j.workshop_id')
      })
      .where({ 'j.workshop_id': workshopId, 'm.user_id': userId })
      .select('j.id', 'j.code', 'j.title', 'j.site', 'j.due_on', 'j.state', 'j.sample_state')
      .select(db.raw(`(${itemCount}) AS item_count`))
      .orderByRaw('j.due_on NULLS LAST')
  },
  list(db: Knex, workshopId: number): Promise<JobListRow[]> {
    return db('jobs as j').where('j.workshop_id', workshopId)
      .select(JOB_COLUMNS.map(c => `j.${c}`))
      .select(db.raw(`(${itemCount}) AS item_count`))
      .select(db.raw('(SELECT count(*)::int FROM job_members m WHERE m.job_id = j.id AND m.workshop_id = j.workshop_id) AS member_count'))
      .orderByRaw('j.due_on NULLS LAST, j.code')
  },
  /** The jobs of an organisation with their site's name (the client's page). */
  forOrg(db: Knex, workshopId: number, orgId: number): Promise<{ id: number; code: string; title: string; state: string; site_name: string | null }[]> {
    return db('jobs as j').leftJoin('client_sites as s', function () {
      this.on('s.id', 'j.site_id').andOn('s.workshop_id', 'j.workshop_id')
    }).where({ 'j.workshop_id': workshopId, 'j.client_org_id': orgId })
      .select('j.id', 'j.code', 'j.title', 'j.state', 's.name as site_name').orderBy('j.code')
  },
  async clientOrgId(db: Knex, workshopId: number, id: number): Promise<number | null> {
    const row = await db('jobs').first('client_org_id').where({ workshop_id: workshopId, id })
    return row?.client_org_id ? Number(row.client_org_id) : null
  },
  byId(db: Knex, workshopId: number, id: number): Promise<JobRow | undefined> {
    return db('jobs').first(JOB_COLUMNS).where({ workshop_id: workshopId, id })
  },
  async isMember(db: Knex, workshopId: number, jobId: number, userId: number) {
    return !!(await db('job_members').first('job_id').where({ workshop_id: workshopId, job_id: jobId, user_id: userId }))
  },
  /** isMember for many (workshop, job, person) at once, in their order: one query. */
  async areMembers(db: Knex, keys: readonly { workshopId: number; jobId: number; userId: number }[]): Promise<boolean[]> {
    const r = await db.raw(`SELECT k.i FROM unnest(?::bigint[], ?::bigint[], ?::bigint[]) WITH ORDINALITY AS k(workshop_id, job_id, user_id, i)
      JOIN job_members m ON m.workshop_id = k.workshop_id AND m.job_id = k.job_id AND m.user_id = k.user_id`,
    [keys.map(k => k.workshopId), keys.map(k => k.jobId), keys.map(k => k.userId)])
    const found = new Set((r.rows as { i: number | string }[]).map(row => Number(row.i)))
    return keys.map((_, n) => found.has(n + 1))
  },
  members(db: Knex, workshopId: number, jobId: number): Promise<JobMemberRow[]> {
    return db('job_members as m').join('users as u', function () {
      this.on('u.id', 'm.user_id').andOn('u.workshop_id', 'm.workshop_id')
    }).where({ 'm.workshop_id': workshopId, 'm.job_id': jobId })
      .select('u.id', 'u.name', 'u.email').orderBy('u.name')
  },
  /** The ids of the jobs a user is a member of (a client's live rooms). */
  async memberJobIds(db: Knex, workshopId: number, userId: number): Promise<number[]> {
    const ids: (number | string)[] = await db('job_members').where({ workshop_id: workshopId, user_id: userId }).pluck('job_id')
    return ids.map(Number)
  },
  addMember(db: Knex, workshopId: number, jobId: number, userId: number) {
    return db('job_members').insert({ workshop_id: workshopId, job_id: jobId, user_id: userId }).onConflict(['job_id', 'user_id']).ignore()
  },
  removeMember(db: Knex, workshopId: number, jobId: number, userId: number) {
    return db('job_members').where({ workshop_id: workshopId, job_id: jobId, user_id: userId }).del()
  },
  async insert(db: Knex, workshopId: number, input: JobInput): Promise<JobRow> {
    try {
      const [row] = await db('jobs').insert({
        workshop_id: workshopId, ...toColumns(input),
        sample_state: input.sampleRequired ? 'awaiting_cast' : 'not_required',
      }).returning(JOB_COLUMNS)
      return row
    }
    catch (err) {
      rethrowDbError(err, UNIQUE_LABELS)
    }
  },
  /** The job codes this workshop already uses (an import refuses them). */
  async codes(db: Knex, workshopId: number): Promise<Set<string>> {
    return new Set(await db('jobs').where({ workshop_id: workshopId }).pluck('code'))
  },
  /** Many jobs at once (an import); their ids by code. */
  async insertMany(db: Knex, workshopId: number, rows: JobInput[]): Promise<Map<string, number>> {
    const out = new Map<string, number>()
    for (let i = 0; i < rows.length; i += 500) {
      const got: { id: number; code: string }[] = await db('jobs').insert(rows.slice(i, i + 500).map(r => ({
        workshop_id: workshopId, ...toColumns(r), sample_state: r.sampleRequired ? 'awaiting_cast' : 'not_required',
      }))).returning(['id', 'code'])
      for (const g of got) out.set(g.code, Number(g.id))
    }
    return out
  },
  update(db: Knex, workshopId: number, id: number, version: number, input: JobInput & { sampleState?: string }): Promise<JobRow> {
    const cols: Record<string, unknown> = toColumns(input)
    if (input.sampleState) cols.sample_state = input.sampleState
    return updateVersioned<JobRow>(db, 'jobs', { workshopId, id, version }, cols, JOB_COLUMNS, 'Job')
  },
  /** The client's decision, only while the sample awaits approval; 0 rows when it no longer does. */
  decideSample(db: Knex, workshopId: number, id: number, d: { decision: string; comment: string | null; userId: number }): Promise<JobRow[]> {
    return db('jobs').where({ workshop_id: workshopId, id, sample_state: 'awaiting_approval' })
      .update({
        sample_state: d.decision, sample_comment: d.comment, sample_decided_by: d.userId, sample_decided_at: db.fn.now(),
        version: db.raw('version + 1'), updated_at: db.fn.now(),
      }).returning(JOB_COLUMNS)
  },
  /** The deposit a job asks before its moulds start, in minor units (0: none), or undefined for no such job. */
  async deposit(db: Knex, workshopId: number, id: number): Promise<number | undefined> {
    const row = await db('jobs').first('deposit_minor').where({ workshop_id: workshopId, id })
    return row ? Number(row.deposit_minor) : undefined
  },
  async setDeposit(db: Knex, workshopId: number, id: number, minor: number): Promise<boolean> {
    return (await db('jobs').where({ workshop_id: workshopId, id }).update({ deposit_minor: minor, updated_at: db.fn.now() })) > 0
  },
}
