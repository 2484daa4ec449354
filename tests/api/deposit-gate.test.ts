// The deposit gate, like the sample gate: a job that asks a deposit not yet paid has its moulds
// not started. The planner leaves its items out and says why, the board shows the gate on its
// items and pours, and a pour of it cannot be started on the floor. Paying lifts the gate; a
// refund puts it back.
import { randomUUID } from 'node:crypto'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { call, signIn } from '../setup/http'
import { DEMO_PASSWORD, closeTestDb, demo } from '../setup/fixtures'
import { boardFixture } from '../setup/board-fixtures'

// a week of its own (each file has its own database; a Monday to Friday far from the demo's days)
const range = { from: '2027-09-06', to: '2027-09-10' }
let lead = ''
let caster = ''
let fx: Awaited<ReturnType<typeof boardFixture>>

beforeAll(async () => {
  lead = await signIn(demo.lead.email, DEMO_PASSWORD)
  caster = await signIn(demo.caster1.email, DEMO_PASSWORD)
  fx = await boardFixture('gate')
})
afterAll(closeTestDb)

const pay = (jobId: number, amount: number) => call(`/api/jobs/${jobId}/payments`, { method: 'POST', cookie: lead, body: { amount, method: 'bank_transfer', paidOn: '2027-09-01' } })
const preview = () => call('/api/planner/preview', { method: 'POST', cookie: lead, body: range })
const board = () => call(`/api/board?from=${range.from}&to=${range.to}`, { cookie: lead })

describe('the deposit gate', () => {
  it('leaves a job waiting for its deposit out of the planner, saying why, until it is paid in full', async () => {
    const job = await fx.job({ deposit_minor: 5000, due_on: '2027-09-30' })
    const item = await fx.item(job, await fx.mould(), { pieces_needed: 2 })
    const free = await fx.item(await fx.job({ due_on: '2027-09-30' }), await fx.mould(), { pieces_needed: 2 })
    const before = await preview()
    expect(before.status).toBe(200)
    expect(before.data.pours.filter((p: { jobItemId: number }) => p.jobItemId === item)).toEqual([])
    expect(before.data.pours.filter((p: { jobItemId: number }) => p.jobItemId === free)).toHaveLength(2)
    expect(before.data.unplaced.find((u: { itemId: number }) => u.itemId === item)).toMatchObject({ reason: 'deposit-awaiting', pieces: 2, message: expect.stringMatching(/waits for deposit/) })

    // part of it is not enough
    expect((await pay(job, 4999)).status).toBe(201)
    expect((await preview()).data.unplaced.find((u: { itemId: number }) => u.itemId === item)).toMatchObject({ reason: 'deposit-awaiting' })
    expect((await pay(job, 1)).status).toBe(201)
    const after = await preview()
    expect(after.data.pours.filter((p: { jobItemId: number }) => p.jobItemId === item)).toHaveLength(2)
    expect(after.data.unplaced.find((u: { itemId: number }) => u.itemId === item)).toBeUndefined()
  })

  it('shows the gate on the board\'s items and on the job\'s pours, lifted when paid and back after a refund', async () => {
    const job = await fx.job({ deposit_minor: 2500 })
    const item = await fx.item(job, await fx.mould())
    const planned = await call('/api/pours', { method: 'POST', cookie: lead, body: { mouldId: await fx.mould(), slotStart: '2027-09-08T09:00:00Z', jobItemId: item, casterId: fx.casterId } })
    // the lead may pencil the pour in; it is the start that waits
    expect(planned.status, JSON.stringify(planned.data)).toBe(201)
    const waiting = (await board()).data
    expect(waiting.jobItems.find((i: { id: number }) => i.id === item)).toMatchObject({ depositWaiting: true })
    expect(waiting.depositWaitingJobs).toContain(job)
    const paid = await pay(job, 2500)
    const lifted = (await board()).data
    expect(lifted.jobItems.find((i: { id: number }) => i.id === item)).toMatchObject({ depositWaiting: false })
    expect(lifted.depositWaitingJobs).not.toContain(job)
    const payment = paid.data.payments.find((p: { amount: number }) => p.amount === 2500)
    expect((await call(`/api/payments/${payment.id}/refund`, { method: 'POST', cookie: lead })).status).toBe(200)
    expect((await board()).data.depositWaitingJobs).toContain(job)
  })

  it('refuses to start a pour of a job waiting for its deposit on the floor, in words, and starts it once paid', async () => {
    const job = await fx.job({ deposit_minor: 10000 })
    const code = (await fx.k('jobs').where({ id: job }).first('code')).code
    const item = await fx.item(job, null)
    const p = await call('/api/pours', { method: 'POST', cookie: lead, body: { mouldId: await fx.mould(), slotStart: '2027-09-09T09:00:00Z', jobItemId: item, casterId: fx.casterId } })
    expect(p.status).toBe(201)
    const start = () => call(`/api/pours/${p.data.id}/actions`, { method: 'POST', cookie: caster, body: { actionId: randomUUID(), kind: 'start_mixing', version: 1, waterTempC: 18 } })
    const refused = await start()
    expect(refused.status).toBe(409)
    expect(refused.data.message).toBe(`Job ${code} waits for its deposit: do not start this pour until the deposit is paid; ask the lead`)
    expect((await fx.k('pours').where({ id: p.data.id }).first('state')).state).toBe('planned')
    expect(await fx.k('events').where({ entity: 'pour', entity_id: String(p.data.id), type: 'pour.mixing' }).first()).toBeUndefined()
    expect((await pay(job, 10000)).status).toBe(201)
    const ok = await start()
    expect(ok.status, JSON.stringify(ok.data)).toBe(200)
    expect(ok.data.card.pour).toMatchObject({ id: p.data.id, state: 'mixing' })
  })
})
