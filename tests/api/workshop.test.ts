// Workshop settings: validation naming the field, versioned saves, tenancy, the heaviest crate
// in the workshop's mass units.
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
      [{ ...s, crateMaxKg: 'heavy' }, 'crateMaxKg'],
      [{ ...s, crateMaxKg: 2500 }, 'crateMaxKg'],
    ]
    for (const [body, field] of cases) {
      const r = await call('/api/workshop', { method: 'PATCH', cookie: lead, body })
      expect(r.status, field).toBe(422)
      expect(r.data.data.problems[0].field).toBe(field)
    }
  })

  it('sets the heaviest crate in kg, and refuses one out of range in the units the form shows', async () => {
    const s = (await call('/api/workshop', { cookie: lead })).data
    // the demo workshop keeps the column's default (db/migrations/20261206070000_crates_deliveries.ts)
    expect(s.crateMaxKg).toBe(250)
    const saved = await call('/api/workshop', { method: 'PATCH', cookie: lead, body: { ...s, crateMaxKg: 180.5 } })
    expect(saved.status).toBe(200)
    expect(saved.data.crateMaxKg).toBe(180.5)
    expect((await call('/api/workshop', { cookie: lead })).data.crateMaxKg).toBe(180.5)
    // a save that leaves it out (an older form) keeps it
    const { crateMaxKg: _left, ...without } = saved.data
    const kept = await call('/api/workshop', { method: 'PATCH', cookie: lead, body: without })
    expect(kept.status).toBe(200)
    expect(kept.data.crateMaxKg).toBe(180.5)

    const metric = await call('/api/workshop', { method: 'PATCH', cookie: lead, body: { ...kept.data, crateMaxKg: 9.5 } })
    expect(metric.status).toBe(422)
    expect(metric.data.data.problems).toEqual([{ field: 'crateMaxKg', message: 'Heaviest crate must be between 10 and 2000 kg' }])
    // on imperial the bounds are read in lb, rounded inwards (1 lb = 0.45359237 kg, NIST SP 811):
    // 10 kg = 22.05 lb → 22.1, 2000 kg = 4409.25 lb → 4409.2
    const imperial = await call('/api/workshop', { method: 'PATCH', cookie: lead, body: { ...kept.data, units: 'imperial', crateMaxKg: 2000.5 } })
    expect(imperial.status).toBe(422)
    expect(imperial.data.message).toBe('Heaviest crate must be between 22.1 and 4409.2 lb')
    const notNumber = await call('/api/workshop', { method: 'PATCH', cookie: lead, body: { ...kept.data, crateMaxKg: '200' } })
    expect(notNumber.data.data.problems[0]).toEqual({ field: 'crateMaxKg', message: 'Heaviest crate must be a number' })
    const after = (await call('/api/workshop', { cookie: lead })).data
    expect(after).toMatchObject({ crateMaxKg: 180.5, units: 'metric', version: kept.data.version })
    expect((await call('/api/workshop', { method: 'PATCH', cookie: lead, body: { ...after, crateMaxKg: 250 } })).status).toBe(200)
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
