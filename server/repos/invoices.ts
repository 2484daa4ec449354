// Every knex call for invoices. An issued invoice is never updated except to void it (the WHERE
// says so too); numbers follow on per workshop under a transaction lock like quote numbers.
import type { Knex } from 'knex'
import type { InvoiceLine } from '#shared/types/invoices'

export interface InvoiceRow {
  id: number
  workshop_id: number
  job_id: number
  job_code: string
  number: number
  dispatch_id: number | null
  note_no: string | null
  stage: string | null
  status: 'issued' | 'void'
  lines: InvoiceLine[]
  currency: string
  net: number
  tax: number
  total: number
  deposit_credit: number
  amount_due: number
  void_reason: string | null
  issued_at: Date
  voided_at: Date | null
}

const COLUMNS = ['v.id', 'v.workshop_id', 'v.job_id', 'j.code as job_code', 'v.number', 'v.dispatch_id', 'd.note_no', 'v.stage', 'v.status',
  'v.lines', 'v.currency', 'v.net', 'v.tax', 'v.total', 'v.deposit_credit', 'v.amount_due', 'v.void_reason', 'v.issued_at', 'v.voided_at']

function base(db: Knex, workshopId: number) {
  return db('invoices as v').join('jobs as j', function () {
    this.on('j.id', 'v.job_id').andOn('j.workshop_id', 'v.workshop_id')
  }).leftJoin('dispatches as d', function () {
    this.on('d.id', 'v.dispatch_id').andOn('d.workshop_id', 'v.workshop_id')
  }).where('v.workshop_id', workshopId)
}

export const invoicesRepo = {
  list(db: Knex, workshopId: number): Promise<InvoiceRow[]> {
    return base(db, workshopId).select(COLUMNS).orderBy('v.number', 'desc')
  },
  byId(db: Knex, workshopId: number, id: number): Promise<InvoiceRow | undefined> {
    return base(db, workshopId).first(COLUMNS).where('v.id', id)
  },
  /** The invoices of the jobs a client user is a member of. */
  forClient(db: Knex, workshopId: number, userId: number): Promise<InvoiceRow[]> {
    return base(db, workshopId).select(COLUMNS)
      .whereExists(db('job_members as m').select(db.raw('1')).whereRaw('m.job_id = v.job_id AND m.workshop_id = v.workshop_id').where('m.user_id', userId))
      .orderBy('v.number', 'desc')
  },
  /** The deposit already credited on the job's issued invoices. */
  async depositCredited(db: Knex, workshopId: number, jobId: number): Promise<number> {
    const row = await db('invoices').where({ workshop_id: workshopId, job_id: jobId, status: 'issued' }).sum({ total: 'deposit_credit' }).first()
    return Number(row?.total ?? 0)
  },
  async insert(db: Knex, row: Omit<InvoiceRow, 'id' | 'job_code' | 'note_no' | 'number' | 'status' | 'void_reason' | 'issued_at' | 'voided_at'> & { issued_by: number }): Promise<number> {
    // numbers follow on per workshop: two invoices issued at once take turns on a lock held to
    // the end of the caller's transaction, so they never draw the same number
    await db.raw('SELECT pg_advisory_xact_lock(hashtext(\'invoices.number\'), ?::int)', [row.workshop_id])
    const [{ next }] = await db('invoices').where({ workshop_id: row.workshop_id }).select(db.raw('coalesce(max(number), 0) + 1 as next'))
    const [r] = await db('invoices').insert({ ...row, number: next, lines: JSON.stringify(row.lines) }).returning('id')
    return Number(r.id)
  },
  /** The same lock, taken before the job's earlier credit is read, so a deposit is never credited twice. */
  async lockNumbers(db: Knex, workshopId: number): Promise<void> {
    await db.raw('SELECT pg_advisory_xact_lock(hashtext(\'invoices.number\'), ?::int)', [workshopId])
  },
  async void(db: Knex, workshopId: number, id: number, reason: string): Promise<boolean> {
    return (await db('invoices').where({ workshop_id: workshopId, id, status: 'issued' }).update({ status: 'void', void_reason: reason, voided_at: db.fn.now() })) > 0
  },
  /** Rows for the accounts' CSV, oldest first. */
  exportQuery(db: Knex, workshopId: number) {
    return base(db, workshopId).leftJoin('client_orgs as c', function () {
      this.on('c.id', 'j.client_org_id').andOn('c.workshop_id', 'j.workshop_id')
    }).select('v.number', 'v.issued_at', 'j.code as job_code', 'c.name as client', 'v.stage', 'd.note_no', 'v.status', 'v.currency',
      'v.net', 'v.tax', 'v.total', 'v.deposit_credit', 'v.amount_due', 'v.void_reason').orderBy('v.number')
  },
}
