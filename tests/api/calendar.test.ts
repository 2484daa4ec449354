// The shop's closures and the casters' weeks: the lead sets them, the planner keeps to them.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { call, signIn } from '../setup/http'
import { DEMO_PASSWORD, closeTestDb, demo } from '../setup/fixtures'
import { boardFixture } from '../setup/board-fixtures'

// The week of Monday 4 October 2027 (BST: local 07:30 is 06:30 UTC), away from other files' days.
const range = { from: '2027-10-04', to: '2027-10-08' }
let lead = ''
let fx: Awaited<ReturnType<typeof boardFixture>>

beforeAll(async () => {
  lead = await signIn(demo.lead.email, DEMO_PASSWORD)
  fx = await boardFixture('cal')
})
afterAll(closeTestDb)

const week = (userId: number, body: Record<string, unknown>) => call(`/api/users/${userId}/hours`, {
  method: 'PUT', cookie: lead, body: { workingDays: null, shiftStart: null, shiftEnd: null, maxMixes: 1, absences: [], ...body },
})
type Pour = { jobItemId: number; day: string; casterId: number | null; mixAt: string }

describe('shop calendar', () => {
  it('stores closures and a caster\'s week, refusing bad ones in the user\'s words', async () => {
    const put = await call('/api/calendar/closures', { method: 'PUT', cookie: lead, body: { closures: [{ fromDay: '2027-10-04', toDay: '2027-10-04', reason: 'Bank holiday' }] } })
    expect(put.status).toBe(200)
    expect(put.data.closures).toEqual([{ fromDay: '2027-10-04', toDay: '2027-10-04', reason: 'Bank holiday' }])
    const backwards = await call('/api/calendar/closures', { method: 'PUT', cookie: lead, body: { closures: [{ fromDay: '2027-10-05', toDay: '2027-10-04' }] } })
    expect(backwards.status).toBe(422)
    expect(backwards.data.data.problems[0]).toMatchObject({ field: 'closures.0.toDay', message: expect.stringContaining('To must not be before') })

    const ok = await week(fx.casterId, { shiftStart: '10:00', absences: [{ fromDay: '2027-10-05', toDay: '2027-10-05', reason: 'Dentist' }] })
    expect(ok.status).toBe(200)
    expect(ok.data).toMatchObject({ userId: fx.casterId, shiftStart: '10:00', shiftEnd: null, workingDays: null, maxMixes: 1, absences: [{ fromDay: '2027-10-05', toDay: '2027-10-05', reason: 'Dentist' }] })
    const lateEnd = await week(fx.casterId, { shiftStart: '10:00', shiftEnd: '09:00' })
    expect(lateEnd.status).toBe(422)
    expect(lateEnd.data.data.problems[0].field).toBe('shiftEnd')
    const leadId = Number((await fx.k('users').where({ email: demo.lead.email }).first('id')).id)
    const notCaster = await week(leadId, {})
    expect(notCaster.status).toBe(422)
    expect(notCaster.data.data.problems[0].message).toContain('only casters have casting hours')
    const cal = await call('/api/calendar', { cookie: lead })
    expect(cal.data.casters.find((c: { userId: number }) => c.userId === fx.casterId).absences).toHaveLength(1)
  })

  it('plans around the closure and books casters only when they are at work', async () => {
    // every other caster is away this week, so the first caster's week decides
    const cal = (await call('/api/calendar', { cookie: lead })).data
    for (const c of cal.casters) {
      if (c.userId !== fx.casterId) expect((await week(c.userId, { absences: [{ fromDay: '2027-10-01', toDay: '2027-10-31', reason: 'Away' }] })).status).toBe(200)
    }
    const mould = await fx.mould()
    const item = await fx.item(await fx.job({ due_on: '2027-10-29' }), mould, { pieces_needed: 2 })
    const r = await call('/api/planner/preview', { method: 'POST', cookie: lead, body: range })
    expect(r.status).toBe(200)
    const mine: Pour[] = r.data.pours.filter((p: Pour) => p.jobItemId === item)
    expect(mine.length).toBe(2)
    // Monday is closed and the caster is at the dentist on Tuesday: Wednesday, from 10:00 BST (09:00 UTC)
    for (const p of mine) {
      expect(p.day).toBe('2027-10-06')
      expect(p.casterId).toBe(fx.casterId)
      expect(p.mixAt >= '2027-10-06T09:00:00.000Z').toBe(true)
    }

    // every caster away past the planning horizon: nobody can cast, and the plan says so
    for (const c of cal.casters) expect((await week(c.userId, { absences: [{ fromDay: '2027-10-01', toDay: '2029-12-31', reason: 'Long leave' }] })).status).toBe(200)
    const none = await call('/api/planner/preview', { method: 'POST', cookie: lead, body: range })
    expect(none.data.unplaced.find((u: { itemId: number }) => u.itemId === item)).toMatchObject({ reason: 'no-caster', message: expect.stringContaining('No caster is at work') })
  })
})
