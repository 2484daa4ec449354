// Deposits and payments. A job may ask a deposit before its moulds start; the client pays it on
// the hosted payment service's checkout page (Setline never sees card data), or a lead records
// a payment taken another way. The service tells Setline through a signed webhook: a bad
// signature, a replayed event or an amount that does not match what was asked changes nothing
// and is logged. Refunds of card payments go back through the service.
import type { Knex } from 'knex'
import type { Actor } from '../utils/auth'
import { paymentsRepo, type PaymentRow } from '../repos/payments'
import { jobsRepo } from '../repos/jobs'
import { ratesRepo } from '../repos/rates'
import { recordEvent } from '../repos/events'
import { paymentsClient, verifiedEvent } from '../utils/payments'
import { isoOrNull } from './catalogue'
import type { ClientDeposit, DepositState, JobPayments, Payment } from '#shared/types/payments'

function toPayment(r: PaymentRow): Payment {
  return {
    id: r.id, purpose: r.purpose, amount: r.amount, currency: r.currency, method: r.method, status: r.status, note: r.note,
    paidAt: isoOrNull(r.paid_at), refundedAt: isoOrNull(r.refunded_at), createdAt: r.created_at.toISOString(),
  }
}

async function depositState(db: Knex, workshopId: number, jobId: number): Promise<DepositState> {
  const deposit = await jobsRepo.deposit(db, workshopId, jobId)
  if (deposit === undefined) notFound('Job')
  const paid = await paymentsRepo.paidDeposit(db, workshopId, jobId)
  const { currency } = await ratesRepo.get(db, workshopId)
  const outstanding = Math.max(0, deposit - paid)
  return { currency, depositMinor: deposit, paidMinor: paid, outstandingMinor: outstanding, released: outstanding === 0 }
}

/** Whether a job's moulds may start: no deposit asked, or the deposit paid in full. */
export async function depositReleased(db: Knex, workshopId: number, jobId: number): Promise<boolean> {
  return (await depositState(db, workshopId, jobId)).released
}

export async function jobPayments(workshopId: number, jobId: number): Promise<JobPayments> {
  const db = useDb()
  const state = await depositState(db, workshopId, jobId)
  return { ...state, payments: (await paymentsRepo.forJob(db, workshopId, jobId)).map(toPayment) }
}

export async function setDeposit(actor: Actor, jobId: number, depositMinor: number): Promise<JobPayments> {
  await useDb().transaction(async (trx) => {
    if (!(await jobsRepo.setDeposit(trx, actor.workshopId, jobId, depositMinor))) notFound('Job')
    await recordEvent(trx, { workshopId: actor.workshopId, entity: 'job', entityId: jobId, type: 'deposit.asked', actorId: actor.id, data: { depositMinor } })
  })
  return jobPayments(actor.workshopId, jobId)
}

export async function recordPayment(actor: Actor, jobId: number, input: { amount: number; method: PaymentRow['method']; paidOn: string; note?: string | null }): Promise<JobPayments> {
  await useDb().transaction(async (trx) => {
    const { currency } = await depositState(trx, actor.workshopId, jobId)
    const row = await paymentsRepo.insert(trx, {
      workshop_id: actor.workshopId, job_id: jobId, purpose: 'deposit', amount: input.amount, currency, method: input.method,
      status: 'paid', provider_ref: null, recorded_by: actor.id, note: input.note ?? null, paid_at: new Date(`${input.paidOn}T12:00:00Z`),
    })
    await recordEvent(trx, { workshopId: actor.workshopId, entity: 'job', entityId: jobId, type: 'payment.recorded', actorId: actor.id, data: { paymentId: row.id, amount: input.amount, method: input.method } })
  })
  return jobPayments(actor.workshopId, jobId)
}

/** Refunds a paid payment: a card payment through the service first, then marked here. */
export async function refundPayment(actor: Actor, paymentId: number): Promise<JobPayments> {
  const db = useDb()
  const p = await paymentsRepo.byId(db, actor.workshopId, paymentId)
  if (!p) notFound('Payment')
  if (p.status !== 'paid') conflict('Only a paid payment can be refunded')
  if (p.method === 'card') {
    const sdk = paymentsClient()
    if (!sdk || !p.provider_payment) throw createError({ statusCode: 503, message: 'The payment service is not reachable from here; refund it on the service and record it' })
    await sdk.refunds.create({ payment_intent: p.provider_payment }, { idempotencyKey: `refund-${p.id}` })
  }
  await db.transaction(async (trx) => {
    if (await paymentsRepo.markRefunded(trx, actor.workshopId, p.id)) {
      await recordEvent(trx, { workshopId: actor.workshopId, entity: 'job', entityId: p.job_id, type: 'payment.refunded', actorId: actor.id, data: { paymentId: p.id, amount: p.amount } })
    }
  })
  return jobPayments(actor.workshopId, p.job_id)
}

async function memberJob(db: Knex, actor: Actor, jobId: number) {
  if (!(await jobsRepo.byId(db, actor.workshopId, jobId)) || !(await jobsRepo.isMember(db, actor.workshopId, jobId, actor.id))) notFound('Job')
}

export async function clientDeposit(actor: Actor, jobId: number): Promise<ClientDeposit> {
  const db = useDb()
  await memberJob(db, actor, jobId)
  return { ...(await depositState(db, actor.workshopId, jobId)), cardPayments: !!paymentsClient() }
}

/** A checkout on the payment service for what is still to pay; the client is sent to its page. */
export async function startDepositCheckout(actor: Actor, jobId: number): Promise<{ url: string }> {
  const db = useDb()
  await memberJob(db, actor, jobId)
  const sdk = paymentsClient()
  if (!sdk) throw createError({ statusCode: 503, message: 'Card payments are not set up for this workshop; ask the workshop how to pay' })
  const state = await depositState(db, actor.workshopId, jobId)
  if (state.outstandingMinor === 0) conflict('Nothing is left to pay on this deposit')
  const job = (await jobsRepo.byId(db, actor.workshopId, jobId))!
  const payment = await paymentsRepo.insert(db, {
    workshop_id: actor.workshopId, job_id: jobId, purpose: 'deposit', amount: state.outstandingMinor, currency: state.currency,
    method: 'card', status: 'pending', provider_ref: null, recorded_by: actor.id, note: null, paid_at: null,
  })
  const back = `${appEnv().APP_URL}/client/jobs/${jobId}`
  const session = await sdk.checkout.sessions.create({
    mode: 'payment',
    line_items: [{ quantity: 1, price_data: { currency: state.currency.toLowerCase(), unit_amount: state.outstandingMinor, product_data: { name: `Deposit for ${job.code} ${job.title}` } } }],
    client_reference_id: String(payment.id),
    metadata: { paymentId: String(payment.id), workshopId: String(actor.workshopId), jobId: String(jobId) },
    success_url: `${back}?deposit=paid`,
    cancel_url: `${back}?deposit=cancelled`,
  }, { idempotencyKey: `deposit-checkout-${payment.id}` })
  await paymentsRepo.setProviderRef(db, payment.id, session.id)
  if (!session.url) throw createError({ statusCode: 502, message: 'The payment service gave no checkout page' })
  return { url: session.url }
}

export type WebhookOutcome = 'paid' | 'refunded' | 'replay' | 'amount mismatch' | 'unknown payment' | 'ignored'

/**
 * The payment service's webhook. The signature over the raw body is checked first (else 400);
 * each event id is handled once; a completed checkout marks its payment paid only when the
 * amount and currency are what was asked.
 */
export async function handlePaymentWebhook(raw: string, signature: string | undefined): Promise<{ outcome: WebhookOutcome }> {
  const event = verifiedEvent(raw, signature)
  if (!event) {
    useLogger().warn({ webhook: 'payments' }, 'payments webhook refused: bad or missing signature')
    throw createError({ statusCode: 400, message: 'Signature does not match' })
  }
  const outcome = await useDb().transaction(async (trx): Promise<WebhookOutcome> => {
    let result: WebhookOutcome = 'ignored'
    if (event.type === 'checkout.session.completed') {
      const s = event.data.object
      const p = await paymentsRepo.byProviderRef(trx, s.id)
      if (!p) result = 'unknown payment'
      else if (s.amount_total !== p.amount || (s.currency ?? '').toUpperCase() !== p.currency || s.payment_status !== 'paid') result = 'amount mismatch'
      else if (await paymentsRepo.markPaid(trx, p.id, typeof s.payment_intent === 'string' ? s.payment_intent : null)) {
        await recordEvent(trx, { workshopId: p.workshop_id, entity: 'job', entityId: p.job_id, type: 'payment.paid', actorId: null, data: { paymentId: p.id, amount: p.amount, method: 'card' } })
        result = 'paid'
      }
    }
    else if (event.type === 'charge.refunded') {
      const c = event.data.object
      const p = typeof c.payment_intent === 'string' ? await paymentsRepo.byProviderPayment(trx, c.payment_intent) : undefined
      if (!p) result = 'unknown payment'
      else if (await paymentsRepo.markRefunded(trx, p.workshop_id, p.id)) result = 'refunded'
    }
    // a replay is the same event id again: it changes nothing, whatever it says
    if (!(await paymentsRepo.firstSighting(trx, event.id, event.type, result))) throw new ReplayedEvent()
    return result
  }).catch((e: unknown) => {
    if (e instanceof ReplayedEvent) return 'replay' as const
    throw e
  })
  if (outcome === 'amount mismatch' || outcome === 'unknown payment' || outcome === 'replay') {
    useLogger().warn({ webhook: 'payments', type: event.type, eventId: event.id, outcome }, 'payments webhook changed nothing')
  }
  return { outcome }
}

/** Rolls back whatever a replayed event's transaction did. */
class ReplayedEvent extends Error {}
