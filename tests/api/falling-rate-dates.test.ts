// The shop's own falling-rate factor reaches the dates people are given, not only a piece's
// dry-by: once five pieces have been weighed to constant weight (shared/utils/finishing.ts
// finishingFallingRate), the client's ready-by date and the planner's projected ready time
// stretch their drying (after fettling, counted in shift time) by the factor the finishing
// tablet reports. The file's database is its
// own, so the shop starts with no weighed pieces (factor 1, the default).
import { randomUUID } from 'node:crypto'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { call, signIn } from '../setup/http'
import { DEMO_PASSWORD, closeTestDb, demo } from '../setup/fixtures'
import { finishingFixture } from '../setup/finishing-fixtures'
import { FETTLING_ALLOWANCE_HOURS } from '#shared/utils/client-completion'
import { PLASTER_FALLING_RATE_MIN_PIECES } from '#shared/utils/plaster-drying'
import { addShiftHours, type WorkshopShiftCalendar } from '#shared/utils/workshop-calendar'

const HOUR = 3_600_000
const range = { from: '2030-01-07', to: '2030-01-18' }
let fx: Awaited<ReturnType<typeof finishingFixture>>
let finisher = ''
let client = ''
beforeAll(async () => {
  fx = await finishingFixture('falling')
  finisher = await signIn(demo.finisher.email, DEMO_PASSWORD)
  client = await signIn(demo.client1.email, DEMO_PASSWORD)
})
afterAll(closeTestDb)

const act = (pieceId: number, body: Record<string, unknown>) =>
  call(`/api/pieces/${pieceId}/actions`, { method: 'POST', cookie: finisher, body: { actionId: randomUUID(), ...body } })
const iso = (t: number) => new Date(t).toISOString()

describe('the shop\'s falling-rate factor in the dates it gives', () => {
  it('stretches the client\'s ready-by and the planner\'s ready time by the factor its weighings give', async () => {
    // five pieces demoulded 1,000 h back, each item wanting just that piece
    const pieces = []
    for (let i = 0; i < PLASTER_FALLING_RATE_MIN_PIECES; i++) {
      const p = await fx.piece({ hoursBack: 1000, slotStart: `2031-04-0${i + 1}T09:00:00Z` })
      await fx.k('job_items').where({ id: p.itemId }).update({ pieces_needed: 1 })
      pieces.push(p)
    }
    // the client's job: one piece planned, not cast yet, late in the shift (14:30 in London's
    // summer time, the demo's 07:30–16:00 shift), so its fettling waits for the next morning
    const clientJob = await fx.job()
    await fx.k('job_members').insert({ workshop_id: fx.workshopId, job_id: clientJob, user_id: (await fx.k('users').where({ email: demo.client1.email }).first('id')).id })
    const clientItem = await fx.item(clientJob, null, { pieces_needed: 1 })
    const planned = await call('/api/pours', { method: 'POST', cookie: fx.lead, body: { mouldId: await fx.mould(), slotStart: '2030-06-04T13:30:00Z', jobItemId: clientItem, casterId: fx.casterId } })
    expect(planned.status, JSON.stringify(planned.data)).toBe(201)
    const openAt = Date.parse(planned.data.demouldOpenAt)
    // the planner's job: one piece to plan
    const planJob = await fx.job({ due_on: '2030-12-31' })
    const planItem = await fx.item(planJob, await fx.mould(), { pieces_needed: 1 })

    const clientDate = async () => {
      const r = await call(`/api/client/jobs/${clientJob}/progress`, { cookie: client })
      expect(r.status, JSON.stringify(r.data)).toBe(200)
      expect(r.data.completion.kind).toBe('ready_by')
      return Date.parse(r.data.completion.readyBy)
    }
    const plannerReady = async () => {
      const r = await call('/api/planner/preview', { method: 'POST', cookie: fx.lead, body: range })
      expect(r.status, JSON.stringify(r.data)).toBe(200)
      const pour = r.data.pours.find((p: { jobItemId: number }) => Number(p.jobItemId) === planItem)
      const job = r.data.jobs.find((j: { jobId: number }) => Number(j.jobId) === planJob)
      // the cast comes out at the slot's end less the fixture mould's 10 min clean-out
      return { demouldAt: Date.parse(pour.slotEnd) - 10 * 60_000, readyAt: Date.parse(job.readyAt) }
    }
    // fettling counts in the shop's shift time, from the cast's demould
    const ws = await fx.k('workshops').where({ id: fx.workshopId }).first()
    const calendar: WorkshopShiftCalendar = { timezone: ws.timezone, shiftStart: ws.shift_start, shiftEnd: ws.shift_end, workingDays: ws.working_days.map(Number), breaks: ws.shift_breaks }
    const fettled = (out: number) => addShiftHours(calendar, new Date(out), FETTLING_ALLOWANCE_HOURS).getTime()
    expect(fettled(openAt) - openAt).toBeGreaterThan(12 * HOUR)
    const factorNow = async () => (await call('/api/finishing', { cookie: finisher })).data.room.fallingRate as { factor: number; source: string; count: number }

    expect(await factorNow()).toMatchObject({ factor: 1, source: 'default' })
    const clientBefore = await clientDate()
    const planBefore = await plannerReady()

    // each piece put to dry 999 h ago, then shown at constant weight by two weighings 25 h
    // apart, the first at 1.5 × its estimate: it took half as long again as the model said
    for (const p of pieces) {
      const fettledAt = Date.now() - 999 * HOUR
      const put = await act(p.id, { kind: 'fettled', version: 1, at: iso(fettledAt), dryingTempC: 20, dryingHumidityPct: 50 })
      expect(put.status, JSON.stringify(put.data)).toBe(200)
      const estimate = put.data.drying.hours as number
      expect(1.5 * estimate + 25).toBeLessThan(998)
      const kg = Number(p.dryMassKg.toFixed(3))
      expect((await act(p.id, { kind: 'weighed', version: 2, weighedKg: kg, at: iso(fettledAt + 1.5 * estimate * HOUR) })).status).toBe(200)
      expect((await act(p.id, { kind: 'weighed', version: 3, weighedKg: kg, at: iso(fettledAt + (1.5 * estimate + 25) * HOUR) })).status).toBe(200)
    }
    const shop = await factorNow()
    expect(shop).toMatchObject({ source: 'shop', count: PLASTER_FALLING_RATE_MIN_PIECES })
    expect(shop.factor).toBeCloseTo(1.5, 2)

    // the client's date: demould + fettling + drying, the drying now × the factor
    const clientAfter = await clientDate()
    const drying = (t: number) => (t - fettled(openAt)) / HOUR
    expect(drying(clientBefore)).toBeGreaterThan(1)
    expect(drying(clientAfter) / drying(clientBefore)).toBeCloseTo(shop.factor, 2)

    // the planner's: the same cast planned in the same slot, its ready time stretched alike
    const planAfter = await plannerReady()
    expect(planAfter.demouldAt).toBe(planBefore.demouldAt)
    const planDrying = (x: { demouldAt: number; readyAt: number }) => (x.readyAt - fettled(x.demouldAt)) / HOUR
    expect(planDrying(planBefore)).toBeGreaterThan(1)
    expect(planDrying(planAfter) / planDrying(planBefore)).toBeCloseTo(shop.factor, 2)
  })
})
