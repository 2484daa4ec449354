// Mould work: a new mould being made is planned from its available-from day, and the job's
// projected date is when its last piece is ready to dispatch, as the client's date takes it.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { call, signIn } from '../setup/http'
import { DEMO_PASSWORD, closeTestDb, demo } from '../setup/fixtures'
import { boardFixture } from '../setup/board-fixtures'

// Monday 8 November 2027 to Friday 19 November, away from the demo's days and other files'.
const range = { from: '2027-11-08', to: '2027-11-19' }
let lead = ''
let caster = ''
let fx: Awaited<ReturnType<typeof boardFixture>>

beforeAll(async () => {
  lead = await signIn(demo.lead.email, DEMO_PASSWORD)
  caster = await signIn(demo.caster1.email, DEMO_PASSWORD)
  fx = await boardFixture('work')
})
afterAll(closeTestDb)

type Pour = { jobItemId: number; day: string; slotStart: string }

describe('mould work', () => {
  it('works out the available-from day from the stages, and refuses bad input in the user\'s words', async () => {
    const mould = await fx.mould()
    expect((await call(`/api/moulds/${mould}/work`, { cookie: caster })).data).toBeNull()
    // 1 + 3 + 1 working days from Monday 8 Nov: the last stage ends Friday 12, so available Monday 15
    const put = await call(`/api/moulds/${mould}/work`, {
      method: 'PUT', cookie: lead,
      body: { kind: 'new', startedOn: '2027-11-08', assignedTo: fx.casterId, stages: [{ stage: 'model', leadDays: 1 }, { stage: 'running', leadDays: 3 }, { stage: 'case', leadDays: 1, done: false }] },
    })
    expect(put.status).toBe(200)
    expect(put.data).toMatchObject({ mouldId: mould, kind: 'new', state: 'open', availableFrom: '2027-11-15', assignedTo: fx.casterId })
    const early = await call(`/api/moulds/${mould}/work`, { method: 'PUT', cookie: lead, body: { kind: 'repair', stages: [], startedOn: '2027-11-08', availableFrom: '2027-11-01' } })
    expect(early.status).toBe(422)
    expect(early.data.data.problems[0]).toMatchObject({ field: 'availableFrom', message: expect.stringContaining('Available from') })
    expect((await call(`/api/moulds/${mould}/work`, { method: 'PUT', cookie: caster, body: { kind: 'repair', stages: [], startedOn: '2027-11-08' } })).status).toBe(403)
  })

  it('plans a job waiting for its new mould after the available-from day, dated when its pieces are dry', async () => {
    const mould = await fx.mould()
    const job = await fx.job({ due_on: '2027-12-31' })
    const item = await fx.item(job, mould, { pieces_needed: 2 })
    expect((await call(`/api/moulds/${mould}/work`, { method: 'PUT', cookie: lead, body: { kind: 'new', stages: [], startedOn: '2027-11-08', availableFrom: '2027-11-17' } })).status).toBe(200)
    const r = await call('/api/planner/preview', { method: 'POST', cookie: lead, body: range })
    expect(r.status).toBe(200)
    const mine: Pour[] = r.data.pours.filter((p: Pour) => p.jobItemId === item)
    expect(mine.length).toBe(2)
    for (const p of mine) expect(p.day >= '2027-11-17').toBe(true)
    const outcome = r.data.jobs.find((j: { jobId: number }) => j.jobId === job)
    expect(outcome.waitsFor).toEqual({ mouldCode: expect.any(String), availableOn: '2027-11-17' })
    // ready to dispatch only after fettling and drying: later than the day the casts come out
    expect(outcome.projectedDate > mine[mine.length - 1]!.day).toBe(true)
    expect(Date.parse(outcome.readyAt)).toBeGreaterThan(Date.parse(mine[mine.length - 1]!.slotStart) + 2 * 3_600_000)
  })
})
