// The workshop's units and clock on the server: with the workshop on imperial every CSV speaks
// lb, US gal, °F and in (headers name their unit, figures converted with the exact NIST SP 811
// factors); with the workshop in a zone far from UTC, "today" is its local day, not the UTC date.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { call, saveWorkshopSettings, signIn } from '../setup/http'
import { DEMO_PASSWORD, closeTestDb, demo } from '../setup/fixtures'
import { todayIn } from '#shared/utils/workshop-format'

let lead = ''
afterAll(closeTestDb)
beforeAll(async () => {
  lead = await signIn(demo.lead.email, DEMO_PASSWORD)
})

const settings = (patch: Record<string, unknown>) => saveWorkshopSettings(lead, patch)

/** Metric unit words in a CSV header or cell (°C, kg, L, mm, m as units, not inside words). */
const METRIC = /°C|\bkg\b|\(L\)|_L\b|\bL\b(?=[,)\s]|$)|\bmm\b|\(m\)|\bm\b(?=[,)])/

describe('CSV exports on imperial', () => {
  it('name their units in lb, US gal, °F and in and convert the figures', async () => {
    await settings({ units: 'imperial' })
    const jobs = (await call('/api/jobs', { cookie: lead })).data as { id: number }[]
    const exports = ['/api/lots/export', '/api/moulds/export', `/api/jobs/${jobs[0]!.id}/export`, `/api/jobs/${jobs[0]!.id}/register/export`,
      `/api/day-sheet/export?day=${todayIn('Europe/London')}`]
    for (const path of exports) {
      const r = await call(path, { cookie: lead })
      expect(r.status, path).toBe(200)
      const header = String(r.data).split('\n')[0]!
      expect(header, path).not.toMatch(METRIC)
    }
    const lots = String((await call('/api/lots/export', { cookie: lead })).data)
    expect(lots.split('\n')[0]).toContain('bag (lb)')
    // a 25 kg bag is 25 / 0.45359237 = 55.12 lb (NIST SP 811)
    expect(lots).toMatch(/FC-2611-A,Fine casting \(beta\),40,55\.12,/)
    const moulds = String((await call('/api/moulds/export', { cookie: lead })).data)
    expect(moulds.split('\n')[0]).toContain('cavity (US gal),cast length (in)')
    // PM-33: 0.8 L = 0.211 US gal (0.8 / 3.785411784), 0.9 m = 35.4 in (0.9 / 0.0254), NIST SP 811
    expect(moulds).toMatch(/PM-33,.*,0\.211,35\.4,/)
    const register = String((await call(`/api/jobs/${jobs[0]!.id}/register/export`, { cookie: lead })).data)
    expect(register.split('\n')[0]).toContain('shop temp (°F)')
    await settings({ units: 'metric' })
    expect(String((await call('/api/lots/export', { cookie: lead })).data).split('\n')[0]).toContain('bag (kg)')
  })
})

describe('today in a zone far from UTC', () => {
  it('the day sheet opens on the workshop\'s local day when the UTC date differs', async () => {
    // a zone whose date differs from UTC's right now: UTC+14 from 10:00 UTC, UTC−11 before 11:00 UTC (IANA tz database)
    const zone = new Date().getUTCHours() >= 10 ? 'Pacific/Kiritimati' : 'Pacific/Pago_Pago'
    const utcDay = new Date().toISOString().slice(0, 10)
    const localDay = todayIn(zone)
    expect(localDay).not.toBe(utcDay)
    await settings({ timezone: zone })
    try {
      const sheet = await call('/api/day-sheet', { cookie: lead })
      expect(sheet.status).toBe(200)
      expect(sheet.data.day).toBe(localDay)
      expect(sheet.data.timezone).toBe(zone)
      const me = await call('/api/auth/me', { cookie: lead })
      expect(me.data.workshop.timezone).toBe(zone)
      // the zone's offsets come with it, for the pages to write times without Intl: today's
      // offset is the zone's own (UTC+14 or UTC−11 all year, IANA tz database) and spans today
      const offsets = me.data.workshop.zoneOffsets
      expect(offsets.zone).toBe(zone)
      expect(offsets.from).toBeLessThan(Date.now())
      expect(offsets.to).toBeGreaterThan(Date.now() + 300 * 86_400_000)
      expect(offsets.offsets).toEqual([[offsets.from, zone === 'Pacific/Kiritimati' ? 14 * 60 : -11 * 60]])
    }
    finally {
      await settings({ timezone: 'Europe/London' })
    }
  })

  it('an asked-for day is kept as it is', async () => {
    const sheet = await call('/api/day-sheet?day=2027-04-21', { cookie: lead })
    expect(sheet.data).toMatchObject({ day: '2027-04-21', workshopName: 'Larkspur Ornamental Plaster', units: 'metric' })
    expect(sheet.data.shopTemp).toHaveProperty('usual')
  })
})
