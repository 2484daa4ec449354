// The planner from the database: preview proposes, accept writes all or nothing.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { call, signIn, type CallResult } from '../setup/http'
import { DEMO_PASSWORD, closeTestDb, demo } from '../setup/fixtures'
import { boardFixture } from '../setup/board-fixtures'

// The week of Monday 7 June 2027, far from the demo's days and other files'.
const range = { from: '2027-06-07', to: '2027-06-11' }
let lead = ''
let fx: Awaited<ReturnType<typeof boardFixture>>

beforeAll(async () => {
  lead = await signIn(demo.lead.email, DEMO_PASSWORD)
  fx = await boardFixture('plan')
})
afterAll(closeTestDb)

const preview = (body: Record<string, unknown> = range, cookie = lead) => call('/api/planner/preview', { method: 'POST', cookie, body })
const accept = (pours: unknown[], body: Record<string, unknown> = range) => call('/api/planner/accept', { method: 'POST', cookie: lead, body: { ...body, pours } })
const itemPours = async (item: number) => Number((await fx.k('pours').where({ job_item_id: item }).whereNot('state', 'void').count({ n: '*' }).first())!.n)

describe('planner', () => {
  it('previews pours for open items, then accepts them in one go', async () => {
    const mouldId = await fx.mould()
    const job = await fx.job({ due_on: '2027-06-20' })
    const item = await fx.item(job, mouldId, { pieces_needed: 3 })
    const waitingMould = await fx.mould()
    const waiting = await fx.item(await fx.job({ sample_required: true, sample_state: 'awaiting_approval' }), waitingMould)
    const r = await preview()
    expect(r.status).toBe(200)
    const mine = r.data.pours.filter((p: { jobItemId: number }) => p.jobItemId === item)
    expect(mine).toHaveLength(3)
    expect(mine[0]).toMatchObject({ mouldId, mouldCode: expect.stringContaining('-M'), jobId: job, jobCode: expect.any(String), itemDescription: expect.stringContaining('Item') })
    for (const p of mine) expect(p.slotStart >= '2027-06-06T23:00:00.000Z' && p.slotStart < '2027-06-11T23:00:00.000Z').toBe(true)
    expect(r.data.jobs.find((j: { jobId: number }) => j.jobId === job)).toMatchObject({ piecesPlanned: 3, onTime: true })
    expect(r.data.unplaced.find((u: { itemId: number }) => u.itemId === waiting)).toMatchObject({ reason: 'sample-awaiting-approval' })
    expect(await itemPours(item)).toBe(0)

    const ok = await accept(mine.map((p: { jobItemId: number; mouldId: number; slotStart: string; casterId: number | null }) =>
      ({ jobItemId: p.jobItemId, mouldId: p.mouldId, slotStart: p.slotStart, casterId: p.casterId })))
    expect(ok.status).toBe(201)
    expect(ok.data).toEqual({ created: 3 })
    expect(await itemPours(item)).toBe(3)
    const again = await preview()
    expect(again.data.pours.filter((p: { jobItemId: number }) => p.jobItemId === item)).toEqual([])

    const twice = await accept(mine.map((p: { jobItemId: number; mouldId: number; slotStart: string }) => ({ jobItemId: p.jobItemId, mouldId: p.mouldId, slotStart: p.slotStart })))
    expect(twice.status).toBe(409)
    expect(twice.data.message).toContain('This mould is already taken')
    expect(await itemPours(item)).toBe(3)
  })

  it('writes nothing when any accepted pour overlaps', async () => {
    const [a, b] = [await fx.mould(), await fx.mould()]
    const item = await fx.item(await fx.job(), a)
    const r = await accept([
      { jobItemId: item, mouldId: a, slotStart: '2027-06-08T09:00:00+01:00' },
      { jobItemId: item, mouldId: b, slotStart: '2027-06-08T09:00:00+01:00' },
      { jobItemId: item, mouldId: b, slotStart: '2027-06-08T09:10:00+01:00' },
    ])
    expect(r.status).toBe(409)
    expect(await itemPours(item)).toBe(0)
  })

  it('refuses an item waiting for sample approval on accept too', async () => {
    const m = await fx.mould()
    const item = await fx.item(await fx.job({ sample_required: true, sample_state: 'changes_requested' }), m)
    const r = await accept([{ jobItemId: item, mouldId: m, slotStart: '2027-06-09T09:00:00+01:00' }])
    expect(r.status).toBe(409)
    expect(r.data.message).toContain('sample approval')
  })

  it('names bad fields; only a lead plans', async () => {
    const m = await fx.mould()
    const item = await fx.item(await fx.job(), m)
    const cases: [() => Promise<CallResult>, string][] = [
      [() => preview({ from: '2027-06-07', to: '2027-08-01' }), 'to'],
      [() => preview({ from: '2027-06-07' }), 'to'],
      [() => preview({ from: 'June', to: '2027-06-11' }), 'from'],
      [() => accept([]), 'pours'],
      [() => accept([{ jobItemId: item, mouldId: m, slotStart: '2027-07-01T09:00:00Z' }]), 'pours.0.slotStart'],
      [() => accept([{ jobItemId: item, mouldId: 'x', slotStart: '2027-06-08T09:00:00Z' }]), 'pours.0.mouldId'],
      [() => accept([{ jobItemId: item, mouldId: m, slotStart: '2027-06-08T09:00:00Z' }], { from: '2027-06-07', to: '2027-06-01' }), 'to'],
    ]
    for (const [run, field] of cases) {
      const r = await run()
      expect(r.status, field).toBe(422)
      expect(r.data.data.problems[0].field).toBe(field)
    }
    const caster = await signIn(demo.caster1.email, DEMO_PASSWORD)
    expect((await preview(range, caster)).status).toBe(403)
    expect((await call('/api/planner/accept', { method: 'POST', cookie: caster, body: { ...range, pours: [] } })).status).toBe(403)
  })
})
