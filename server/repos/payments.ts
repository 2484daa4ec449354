// Every knex call for payments and payment_webhooks.
import type { Knex } from 'knex'

export interface PaymentRow {
  id: number
  workshop_id: number
  job_id: number
  purpose: 'deposit' | 'invoice'
  amount: number
  currency: string
  method: 'card' | 'bank_transfer' | 'cash' | 'cheque' | 'other'
  status: 'pending' | 'paid' | 'refunded' | 'cancelled'
  provider_ref: string | null
  provider_payment: string | null
  recorded_by: number | null
  note: string | null
  paid_at: Date | null
  refunded_at: Date | null
  created_at: Date
}

const COLUMNS = ['id', 'workshop_id', 'job_id', 'purpose', 'amount', 'currency', 'method', 'status', 'provider_ref', 'provider_payment', 'recorded_by', 'note', 'paid_at', 'refunded_at', 'created_at']

/**
 * SQL: the job aliased `j` asks no deposit, or its paid deposit payments (refunds taken off, as
 * a refunded payment is no longer 'paid') cover it: its moulds may start. The same rule as
 * depositReleased (server/services/payments.ts), for the planner's, the board's and the floor's reads.
 */
export const DEPOSIT_RELEASED = (j = 'j') => `(${j}.deposit_minor = 0 OR (SELECT coalesce(sum(pd.amount), 0) FROM payments pd
  WHERE pd.workshop_id = ${j}.workshop_id AND pd.job_id = ${j}.id AND pd.purpose = 'deposit' AND pd.status = 'paid') >= ${j}.deposit_minor)`

export const paymentsRepo = {
  /** The code of the job item's job when that job still waits for its deposit, else null. */
  async depositWaitingForItem(db: Knex, workshopId: number, itemId: number): Promise<string | null> {
    const row = await db('job_items as i').join('jobs as j', function () {
      this.on('j.id', 'i.job_id').andOn('j.workshop_id', 'i.workshop_id')
    }).first('j.code').where({ 'i.workshop_id': workshopId, 'i.id': itemId }).whereRaw(`NOT ${DEPOSIT_RELEASED('j')}`)
    return row ? row.code : null
  },
  forJob(db: Knex, workshopId: number, jobId: number): Promise<PaymentRow[]> {
    return db('payments').select(COLUMNS).where({ workshop_id: workshopId, job_id: jobId }).orderBy('id')
  },
  byId(db: Knex, workshopId: number, id: number): Promise<PaymentRow | undefined> {
    return db('payments').first(COLUMNS).where({ workshop_id: workshopId, id })
  },
  /** The webhook's lookup: the service names its session, which is unique across workshops. */
  byProviderRef(db: Knex, ref: string): Promise<PaymentRow | undefined> {
    return db('payments').first(COLUMNS).where({ provider_ref: ref }).forUpdate()
  },
  byProviderPayment(db: Knex, ref: string): Promise<PaymentRow | undefined> {
    return db('payments').first(COLUMNS).where({ provider_payment: ref }).forUpdate()
  },
  async insert(db: Knex, row: Omit<PaymentRow, 'id' | 'created_at' | 'refunded_at' | 'provider_payment'> & { provider_payment?: string | null }): Promise<PaymentRow> {
    const [r] = await db('payments').insert(row).returning(COLUMNS)
    return r
  },
  async setProviderRef(db: Knex, id: number, ref: string): Promise<void> {
    await db('payments').where({ id }).update({ provider_ref: ref })
  },
  async markPaid(db: Knex, id: number, providerPayment: string | null): Promise<boolean> {
    return (await db('payments').where({ id, status: 'pending' }).update({ status: 'paid', paid_at: db.fn.now(), provider_payment: providerPayment })) > 0
  },
  async markRefunded(db: Knex, workshopId: number, id: number): Promise<boolean> {
    return (await db('payments').where({ workshop_id: workshopId, id, status: 'paid' }).update({ status: 'refunded', refunded_at: db.fn.now() })) > 0
  },
  async paidDeposit(db: Knex, workshopId: number, jobId: number): Promise<number> {
    const row = await db('payments').where({ workshop_id: workshopId, job_id: jobId, purpose: 'deposit', status: 'paid' }).sum({ total: 'amount' }).first()
    return Number(row?.total ?? 0)
  },
  /** Records a webhook event id; false when it was seen before (a replay). */
  async firstSighting(db: Knex, eventId: string, type: string, outcome: string): Promise<boolean> {
    const rows = await db('payment_webhooks').insert({ event_id: eventId, type, outcome }).onConflict('event_id').ignore().returning('event_id')
    return rows.length > 0
  },
}
