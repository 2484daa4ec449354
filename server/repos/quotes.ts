// Every knex call for quotes and quote_versions. A quote's latest revision is the one with the
// highest number; a revision that is not a draft is never updated except for its status and
// decision (the service checks; the WHERE here says so too).
import type { Knex } from 'knex'
import type { QuoteStatus } from '#shared/types/quotes'
import { updateVersioned } from './versioned'

export interface QuoteRow {
  id: number
  number: number
  title: string
  client_org_id: number | null
  client_name: string | null
  job_id: number | null
  version: number
  updated_at: Date
}

export interface QuoteVersionRow {
  id: number
  quote_id: number
  revision: number
  status: QuoteStatus
  take_off: unknown
  lines: unknown
  currency: string
  net: number
  tax: number
  total: number
  estimate: number
  deposit: number
  sent_at: Date | null
  decided_at: Date | null
  decision_comment: string | null
  created_at: Date
}

export type QuoteFigures = Pick<QuoteVersionRow, 'take_off' | 'lines' | 'currency' | 'net' | 'tax' | 'total' | 'estimate' | 'deposit'>

const QUOTE_COLUMNS = ['q.id', 'q.number', 'q.title', 'q.client_org_id', 'c.name as client_name', 'q.job_id', 'q.version', 'q.updated_at']
const VERSION_COLUMNS = ['id', 'quote_id', 'revision', 'status', 'take_off', 'lines', 'currency', 'net', 'tax', 'total', 'estimate', 'deposit', 'sent_at', 'decided_at', 'decision_comment', 'created_at']

const json = (v: unknown) => JSON.stringify(v)
const figures = (f: QuoteFigures) => ({ ...f, take_off: json(f.take_off), lines: json(f.lines) })

export const quotesRepo = {
  byId(db: Knex, workshopId: number, id: number): Promise<QuoteRow | undefined> {
    return db('quotes as q').leftJoin('client_orgs as c', 'c.id', 'q.client_org_id')
      .first(QUOTE_COLUMNS).where({ 'q.workshop_id': workshopId, 'q.id': id })
  },
  list(db: Knex, workshopId: number): Promise<(QuoteRow & { revision: number; status: QuoteStatus; currency: string; total: number })[]> {
    return db('quotes as q').leftJoin('client_orgs as c', 'c.id', 'q.client_org_id')
      .join('quote_versions as v', function () {
        this.on('v.quote_id', 'q.id').andOn('v.revision', db.raw('(SELECT max(revision) FROM quote_versions WHERE quote_id = q.id)'))
      })
      .select([...QUOTE_COLUMNS, 'v.revision', 'v.status', 'v.currency', 'v.total'])
      .where({ 'q.workshop_id': workshopId }).orderBy('q.number', 'desc')
  },
  /** The quotes of a client organisation with their latest revision that is not a draft. */
  sentToOrg(db: Knex, workshopId: number, clientOrgId: number): Promise<{ id: number; number: number; title: string; revision: number; status: QuoteStatus; currency: string; total: number }[]> {
    return db('quotes as q').join('quote_versions as v', function () {
      this.on('v.quote_id', 'q.id').andOn('v.revision', db.raw('(SELECT max(revision) FROM quote_versions WHERE quote_id = q.id AND status <> \'draft\')'))
    }).select('q.id', 'q.number', 'q.title', 'v.revision', 'v.status', 'v.currency', 'v.total')
      .where({ 'q.workshop_id': workshopId, 'q.client_org_id': clientOrgId }).orderBy('q.number', 'desc')
  },
  revisions(db: Knex, workshopId: number, quoteId: number): Promise<QuoteVersionRow[]> {
    return db('quote_versions').select(VERSION_COLUMNS).where({ workshop_id: workshopId, quote_id: quoteId }).orderBy('revision')
  },
  latest(db: Knex, workshopId: number, quoteId: number): Promise<QuoteVersionRow | undefined> {
    return db('quote_versions').first(VERSION_COLUMNS).where({ workshop_id: workshopId, quote_id: quoteId }).orderBy('revision', 'desc')
  },
  async insert(db: Knex, workshopId: number, input: { title: string; clientOrgId: number | null }): Promise<number> {
    // numbers follow on per workshop: two quotes made at once take turns on a lock held to the
    // end of the caller's transaction (createQuote runs in one), so they never draw the same number
    await db.raw('SELECT pg_advisory_xact_lock(hashtext(\'quotes.number\'), ?::int)', [workshopId])
    const [{ next }] = await db('quotes').where({ workshop_id: workshopId }).select(db.raw('coalesce(max(number), 0) + 1 as next'))
    const [row] = await db('quotes').insert({ workshop_id: workshopId, number: next, title: input.title, client_org_id: input.clientOrgId }).returning('id')
    return Number(row.id)
  },
  /** The quote row held for the caller's transaction (making its job), or undefined. */
  lockForJob(db: Knex, workshopId: number, id: number): Promise<{ id: number; number: number; title: string; client_org_id: number | null; job_id: number | null } | undefined> {
    return db('quotes').first('id', 'number', 'title', 'client_org_id', 'job_id').where({ workshop_id: workshopId, id }).forUpdate()
  },
  async setJob(db: Knex, workshopId: number, id: number, jobId: number): Promise<void> {
    await db('quotes').where({ workshop_id: workshopId, id }).update({ job_id: jobId, version: db.raw('version + 1'), updated_at: db.fn.now() })
  },
  touch(db: Knex, workshopId: number, id: number, version: number, patch: { title?: string; client_org_id?: number | null }): Promise<QuoteRow> {
    return updateVersioned<QuoteRow>(db, 'quotes', { workshopId, id, version }, patch, ['id'], 'Quote')
  },
  async insertRevision(db: Knex, workshopId: number, quoteId: number, revision: number, f: QuoteFigures): Promise<void> {
    await db('quote_versions').insert({ workshop_id: workshopId, quote_id: quoteId, revision, status: 'draft', ...figures(f) })
  },
  async updateDraft(db: Knex, workshopId: number, id: number, f: QuoteFigures): Promise<void> {
    await db('quote_versions').where({ workshop_id: workshopId, id, status: 'draft' }).update(figures(f))
  },
  async setStatus(db: Knex, workshopId: number, id: number, from: QuoteStatus[], status: QuoteStatus, extra: { sent?: boolean; decided?: boolean; comment?: string | null } = {}): Promise<boolean> {
    const n = await db('quote_versions').where({ workshop_id: workshopId, id }).whereIn('status', from).update({
      status,
      ...(extra.sent && { sent_at: db.fn.now() }),
      ...(extra.decided && { decided_at: db.fn.now(), decision_comment: extra.comment ?? null }),
    })
    return n > 0
  },
}
