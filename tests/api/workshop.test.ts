// Workshop settings: validation naming the field, versioned saves, tenancy.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { call, signIn } from '../setup/http'
import { DEMO_PASSWORD, closeTestDb, demo, makeOtherWorkshop } from '../setup/fixtures'

let lead = ''
afterAll(closeTestDb)
beforeAll(async () => {
  lead = await signIn(demo.lead.email, DEMO_PASSWORD)
})

describe('workshop settings', () => {
  it('saves a change, bumps the version and refuses a stale save with 409', async () => {
    const before = (await call('/api/workshop', { cookie: lead })).data
    expect(before).toMatchObject({ name: 'Larkspur Ornamental Plaster', units: 'metric', timezone: 'Europe/London', shiftStart: '07:30' })
    const saved = await call('/api/workshop', { method: 'PATCH', cookie: lead, body: { ...before, units: 'imperial', workingDays: [5, 1, 2, 3, 4, 4] } })
    expect(saved.status).toBe(200)
    expect(saved.data.units).toBe('imperial')
    expect(saved.data.workingDays).toEqual([1, 2, 3, 4, 5])
    expect(saved.data.version).toBe(before.version + 1)
    const stale = await call('/api/workshop', { method: 'PATCH', cookie: lead, body: { ...before, units: 'metric' } })
    expect(stale.status).toBe(409)
    const back = await call('/api/workshop', { method: 'PATCH', cookie: lead, body: { ...saved.data, units: 'metric' } })
    expect(back.status).toBe(200)
  })

  it('names each bad field', async () => {
    const s = (await call('/api/workshop', { cookie: lead })).data
    const cases: [Record<string, unknown>, string][] = [
      [{ ...s, units: 'cubits' }, 'units'],
      [{ ...s, timezone: 'Mars/Olympus' }, 'timezone'],
      [{ ...s, shiftStart: '25:00' }, 'shiftStart'],
      [{ ...s, shiftStart: '16:00', shiftEnd: '07:30' }, 'shiftEnd'],
      [{ ...s, workingDays: [0] }, 'workingDays.0'],
      [{ ...s, defaultShopTempC: 90 }, 'defaultShopTempC'],
      [{ ...s, name: '' }, 'name'],
    ]
    for (const [body, field] of cases) {
      const r = await call('/api/workshop', { method: 'PATCH', cookie: lead, body })
      expect(r.status, field).toBe(422)
      expect(r.data.data.problems[0].field).toBe(field)
    }
  })

  it('a lead sees and changes only their own workshop', async () => {
    const other = await makeOtherWorkshop()
    const otherLead = await signIn(other.lead.email, DEMO_PASSWORD)
    const theirs = (await call('/api/workshop', { cookie: otherLead })).data
    expect(theirs.name).toMatch(/^Other workshop/)
    await call('/api/workshop', { method: 'PATCH', cookie: otherLead, body: { ...theirs, name: 'Renamed elsewhere' } })
    expect((await call('/api/workshop', { cookie: lead })).data.name).toBe('Larkspur Ornamental Plaster')
  })
})
