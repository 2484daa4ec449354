// Deposits: a lead asks one, the client pays it on the payment service's page (the local fake,
// through the official SDK), and the service's signed webhook marks it paid. A bad signature, a
// replayed event or an amount that does not match changes nothing. A lead can record a payment
// taken another way, and refund one.
import { randomUUID } from 'node:crypto'
import Stripe from 'stripe'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { baseUrl, call, signIn } from '../setup/http'
import { DEMO_PASSWORD, closeTestDb, demo, testDb } from '../setup/fixtures'

// the fake's fixed signing secret (server/utils/payments.ts, FAKE_WEBHOOK_SECRET)
const WEBHOOK_SECRET = 'whsec_setline_fake'
const signer = new Stripe('sk_test_signer')

let lead = ''
let ada = ''
let ravi = ''
let finisher = ''
let jobId = 0

async function newJobWithAda(deposit: number) {
  const job = await call('/api/jobs', { method: 'POST', cookie: lead, body: { code: `DEP-${randomUUID().slice(0, 6)}`, title: 'Deposit test' } })
  expect(job.status).toBe(201)
  expect((await call(`/api/jobs/${job.data.id}/members`, { method: 'POST', cookie: lead, body: { email: demo.client1.email } })).status).toBeLessThan(300)
  expect((await call(`/api/jobs/${job.data.id}/deposit`, { method: 'PUT', cookie: lead, body: { depositMinor: deposit } })).status).toBe(200)
  return job.data.id as number
}

/** A webhook as the service would send it, signed with `secret`. */
function webhook(type: string, object: Record<string, unknown>, opts: { id?: string; secret?: string } = {}) {
  const payload = JSON.stringify({ id: opts.id ?? `evt_${randomUUID().replace(/-/g, '')}`, object: 'event', type, created: Math.floor(Date.now() / 1000), data: { object } })
  const signature = signer.webhooks.generateTestHeaderString({ payload, secret: opts.secret ?? WEBHOOK_SECRET })
  return fetch(`${baseUrl()}/api/payments/webhook`, { method: 'POST', headers: { 'content-type': 'application/json', 'stripe-signature': signature }, body: payload })
}

const sessionOf = (url: string) => url.split('/').pop()!

beforeAll(async () => {
  lead = await signIn(demo.lead.email, DEMO_PASSWORD)
  ada = await signIn(demo.client1.email, DEMO_PASSWORD)
  ravi = await signIn(demo.client2.email, DEMO_PASSWORD)
  finisher = await signIn(demo.finisher.email, DEMO_PASSWORD)
  jobId = await newJobWithAda(25000)
})
afterAll(closeTestDb)

describe('paying a deposit by card through the payment service', () => {
  it('takes the client to the service\'s page and marks the deposit paid from its webhook', async () => {
    const before = await call(`/api/client/jobs/${jobId}/deposit`, { cookie: ada })
    expect(before.data).toMatchObject({ depositMinor: 25000, paidMinor: 0, outstandingMinor: 25000, released: false, cardPayments: true })
    const checkout = await call(`/api/client/jobs/${jobId}/deposit-checkout`, { method: 'POST', cookie: ada })
    expect(checkout.status).toBe(200)
    const page = await fetch(checkout.data.url)
    expect(await page.text()).toMatch(/No real money/)
    // paying on the service's page: it posts the signed webhook, then sends the client back
    const paid = await fetch(`${checkout.data.url}/complete`, { method: 'POST', redirect: 'manual' })
    expect(paid.status).toBe(303)
    expect(paid.headers.get('location')).toContain(`/client/jobs/${jobId}?deposit=paid`)
    const after = await call(`/api/client/jobs/${jobId}/deposit`, { cookie: ada })
    expect(after.data).toMatchObject({ paidMinor: 25000, outstandingMinor: 0, released: true })
    const events = await testDb()('events').where({ entity: 'job', entity_id: String(jobId), type: 'payment.paid' })
    expect(events).toHaveLength(1)
    // nothing left to pay: no second checkout
    expect((await call(`/api/client/jobs/${jobId}/deposit-checkout`, { method: 'POST', cookie: ada })).status).toBe(409)
  })

  it('ignores a bad signature, a replay and an amount that does not match', async () => {
    const job = await newJobWithAda(10000)
    const checkout = await call(`/api/client/jobs/${job}/deposit-checkout`, { method: 'POST', cookie: ada })
    const session = { id: sessionOf(checkout.data.url), object: 'checkout.session', amount_total: 10000, currency: 'gbp', payment_status: 'paid', payment_intent: `pi_${randomUUID().slice(0, 8)}` }
    const outstanding = async () => (await call(`/api/client/jobs/${job}/deposit`, { cookie: ada })).data.outstandingMinor

    const forged = await webhook('checkout.session.completed', session, { secret: 'whsec_someone_else' })
    expect(forged.status).toBe(400)
    const unsigned = await fetch(`${baseUrl()}/api/payments/webhook`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ id: 'evt_x', type: 'checkout.session.completed', data: { object: session } }) })
    expect(unsigned.status).toBe(400)
    expect(await outstanding()).toBe(10000)

    const short = await webhook('checkout.session.completed', { ...session, amount_total: 100 })
    expect(await short.json()).toEqual({ outcome: 'amount mismatch' })
    const otherCurrency = await webhook('checkout.session.completed', { ...session, currency: 'usd' })
    expect(await otherCurrency.json()).toEqual({ outcome: 'amount mismatch' })
    expect(await outstanding()).toBe(10000)

    const id = `evt_${randomUUID().replace(/-/g, '')}`
    expect(await (await webhook('checkout.session.completed', session, { id })).json()).toEqual({ outcome: 'paid' })
    expect(await (await webhook('checkout.session.completed', session, { id })).json()).toEqual({ outcome: 'replay' })
    expect(await outstanding()).toBe(0)
    const paid = await testDb()('payments').where({ job_id: job, status: 'paid' })
    expect(paid).toHaveLength(1)
  })

  it('refunds a card payment through the service, and the deposit is outstanding again', async () => {
    const p = (await call(`/api/jobs/${jobId}/payments`, { cookie: lead })).data
    const card = p.payments.find((x: { method: string; status: string }) => x.method === 'card' && x.status === 'paid')
    expect((await call(`/api/payments/${card.id}/refund`, { method: 'POST', cookie: finisher })).status).toBe(403)
    const refunded = await call(`/api/payments/${card.id}/refund`, { method: 'POST', cookie: lead })
    expect(refunded.status).toBe(200)
    expect(refunded.data).toMatchObject({ paidMinor: 0, outstandingMinor: 25000, released: false })
    expect(refunded.data.payments.find((x: { id: number }) => x.id === card.id).status).toBe('refunded')
    expect((await call(`/api/payments/${card.id}/refund`, { method: 'POST', cookie: lead })).status).toBe(409)
  })
})

describe('payments a lead records', () => {
  it('records a bank transfer, names bad fields in the user\'s words, and keeps other people out', async () => {
    const bad = await call(`/api/jobs/${jobId}/payments`, { method: 'POST', cookie: lead, body: { amount: 12.5, method: 'barter', paidOn: '03/12/2026' } })
    expect(bad.status).toBe(422)
    const text = JSON.stringify(bad.data)
    expect(text).toMatch(/Amount/)
    expect(text).toMatch(/Paid by/)
    expect(text).toMatch(/Paid on/)
    const ok = await call(`/api/jobs/${jobId}/payments`, { method: 'POST', cookie: lead, body: { amount: 25000, method: 'bank_transfer', paidOn: '2026-12-02', note: 'BACS ref 88' } })
    expect(ok.status).toBe(201)
    expect(ok.data).toMatchObject({ outstandingMinor: 0, released: true })
    // ravi is not on this job; a finisher does not see money
    expect((await call(`/api/client/jobs/${jobId}/deposit`, { cookie: ravi })).status).toBe(404)
    expect((await call(`/api/client/jobs/${jobId}/deposit-checkout`, { method: 'POST', cookie: ravi })).status).toBe(404)
    expect((await call(`/api/jobs/${jobId}/payments`, { cookie: finisher })).status).toBe(403)
  })
})
