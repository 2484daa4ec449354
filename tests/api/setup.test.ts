// First-run set-up (server/services/setup.ts): the code printed on the console works once and
// until it expires, the workshop and its lead are created with no demo rows, and the page and
// routes are gone (404) once a workshop exists.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { call } from '../setup/http'
import { testDb } from '../setup/fixtures'
import { startEmptyServer } from '../setup/empty-server'

const SHOP = {
  name: 'Quarry Lane Mouldings', units: 'imperial', timezone: 'America/Chicago', shiftStart: '06:30', shiftEnd: '15:00',
  // 450 lb typed on the imperial form: 450 × 0.45359237 = 204.117 kg to the column's three decimals (NIST SP 811)
  workingDays: [2, 1, 3, 4], defaultShopTempC: 20, defaultHumidityPct: 45, crateMaxKg: 204.117,
  leadName: 'Ada Lead', leadEmail: 'Ada.Lead@quarry.example.test', leadPassword: 'first-lead-pass-1',
}

describe('on the seeded server (a workshop exists)', () => {
  it('answers 404 for the set-up page and both routes', async () => {
    expect((await call('/api/setup')).status).toBe(404)
    expect((await call('/api/setup', { method: 'POST', body: { ...SHOP, code: 'ABCD-EFGH-JKMN' } })).status).toBe(404)
    const page = await fetch(`${(await import('../setup/context')).testContext().baseUrl}/setup`)
    expect(page.status).toBe(404)
  })
})

describe('on an empty database', () => {
  let empty: Awaited<ReturnType<typeof startEmptyServer>>
  beforeAll(async () => {
    empty = await startEmptyServer()
    await empty.use()
  }, 90_000)
  afterAll(async () => {
    await empty?.stop()
  })

  it('prints a code at boot, refuses a wrong, malformed or expired one, then sets up once', async () => {
    await expect.poll(() => empty.codes().length, { timeout: 20_000 }).toBe(1)
    const [first] = empty.codes()
    expect((await call('/api/setup')).data).toEqual({ open: true, newCodePrinted: false })

    const wrong = await call('/api/setup', { method: 'POST', body: { ...SHOP, code: 'AAAA-AAAA-AAAA' } })
    expect(wrong.status).toBe(422)
    expect(JSON.stringify(wrong.data)).toMatch(/Set-up code is wrong, used or expired/)
    const malformed = await call('/api/setup', { method: 'POST', body: { ...SHOP, code: 'abc' } })
    expect(malformed.status).toBe(422)
    expect(JSON.stringify(malformed.data)).toMatch(/Set-up code is the 12 letters/)
    const badField = await call('/api/setup', { method: 'POST', body: { ...SHOP, code: first, leadPassword: 'short' } })
    expect(badField.status).toBe(422)
    expect(JSON.stringify(badField.data)).toMatch(/Password must be at least 10 characters/)
    // the heaviest crate's bounds in the units chosen on the same form (lb here)
    const lightCrate = await call('/api/setup', { method: 'POST', body: { ...SHOP, code: first, crateMaxKg: 5 } })
    expect(lightCrate.status).toBe(422)
    expect(lightCrate.data.data.problems).toEqual([{ field: 'crateMaxKg', message: 'Heaviest crate must be between 22.1 and 4409.2 lb' }])

    // the code expires: the set-up page then prints a new one, and only the new one works
    await testDb()('setup_codes').update({ expires_at: testDb().raw('now() - interval \'1 second\'') })
    const expired = await call('/api/setup', { method: 'POST', body: { ...SHOP, code: first } })
    expect(expired.status).toBe(422)
    expect((await call('/api/setup')).data).toEqual({ open: true, newCodePrinted: true })
    expect(empty.codes()).toHaveLength(2)
    const fresh = empty.codes()[1]!
    expect(fresh).not.toBe(first)

    // typed in lower case and without dashes, as a person may
    const done = await call('/api/setup', { method: 'POST', body: { ...SHOP, code: fresh.replace(/-/g, '').toLowerCase() } })
    expect(done.status).toBe(200)
    expect(done.data).toMatchObject({ role: 'lead', name: 'Ada Lead', home: '/lead' })
    expect(done.cookie).toBeTruthy()

    const settings = await call('/api/workshop', { cookie: done.cookie })
    expect(settings.status).toBe(200)
    expect(settings.data).toMatchObject({ name: 'Quarry Lane Mouldings', units: 'imperial', timezone: 'America/Chicago', shiftStart: '06:30', shiftEnd: '15:00', workingDays: [1, 2, 3, 4], defaultShopTempC: 20, defaultHumidityPct: 45, crateMaxKg: 204.117 })

    const db = testDb()
    expect(await db('workshops').count('* as n').first()).toEqual({ n: '1' })
    expect((await db('users').select('email', 'role'))).toEqual([{ email: 'ada.lead@quarry.example.test', role: 'lead' }])
    // no demo rows
    for (const table of ['moulds', 'jobs', 'plaster_grades', 'benches', 'client_orgs']) {
      expect(await db(table).count('* as n').first(), table).toEqual({ n: '0' })
    }
    // every code is spent
    expect(await db('setup_codes').whereNull('used_at').count('* as n').first()).toEqual({ n: '0' })

    // single use and gone: the same code again, and the page and routes, are 404
    const again = await call('/api/setup', { method: 'POST', body: { ...SHOP, leadEmail: 'other@quarry.example.test', code: fresh } })
    expect(again.status).toBe(404)
    expect((await call('/api/setup')).status).toBe(404)
    expect((await fetch(`${empty.url}/setup`)).status).toBe(404)
    expect(await db('workshops').count('* as n').first()).toEqual({ n: '1' })

    // the new lead signs in with what they chose
    const login = await call('/api/auth/login', { method: 'POST', body: { email: SHOP.leadEmail, password: SHOP.leadPassword } })
    expect(login.status).toBe(200)
  })
})
