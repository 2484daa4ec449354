// The lead's Today and the warnings stored on pours in the workshop's house style and units,
// and the workshop's locale setting (shared/utils/workshop-format.ts): Today's figures follow
// the units, its days the locale, and a warning stored in kg reads in lb on imperial.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { call, saveWorkshopSettings, signIn } from '../setup/http'
import { DEMO_PASSWORD, closeTestDb, demo } from '../setup/fixtures'
import { boardFixture } from '../setup/board-fixtures'
import { expandBoardPours } from '#shared/utils/board-lean'

let lead = ''
let fx: Awaited<ReturnType<typeof boardFixture>>
afterAll(closeTestDb)
beforeAll(async () => {
  lead = await signIn(demo.lead.email, DEMO_PASSWORD)
  fx = await boardFixture('locale')
})

const settings = (patch: Record<string, unknown>) => saveWorkshopSettings(lead, patch)
const todayLines = async () => {
  const r = await call('/api/overview', { cookie: lead })
  expect(r.status).toBe(200)
  return (r.data.lines as { text: string }[]).map(l => l.text)
}
const lotCode = async (id: number) => (await fx.k('plaster_lots').where({ id }).first('lot_code')).lot_code as string

describe('Today in the workshop\'s units and house style', () => {
  it('writes a short lot in lb and a use-by date in the day style, in either locale', async () => {
    const short = await lotCode(await fx.lot({ bags_received: 1 }))
    const stale = await lotCode(await fx.lot({ use_by: '2026-01-02' }))
    await settings({ units: 'imperial' })
    try {
      const lines = await todayLines()
      // one 25 kg bag, nothing used: 25 / 0.45359237 = 55.1 lb (NIST SP 811), whole pounds
      expect(lines).toContain(`Lot ${short} is running short: 55 lb left`)
      // 2 Jan 2026 is a Friday (Gregorian calendar)
      expect(lines).toContain(`Lot ${stale} is past its use-by date (Fri 2 Jan 2026)`)
      expect(lines.join('\n')).not.toMatch(/\bkg\b|\d{4}-\d{2}-\d{2}/)
      await settings({ locale: 'en-US' })
      expect(await todayLines()).toContain(`Lot ${stale} is past its use-by date (Fri, Jan 2, 2026)`)
    }
    finally {
      await settings({ units: 'metric', locale: 'en-GB' })
    }
    expect(await todayLines()).toContain(`Lot ${short} is running short: 25 kg left`)
  })

  it('writes a missed start\'s time on the 24-hour clock, without a day when it was today', async () => {
    const mouldId = await fx.mould()
    const code = (await fx.k('moulds').where({ id: mouldId }).first('code')).code as string
    // a pour whose slot started 20 minutes ago and was never mixed: a missed start on Today
    const start = new Date(Date.now() - 20 * 60_000)
    const posted = await call('/api/pours', { method: 'POST', cookie: lead, body: { mouldId, slotStart: start.toISOString() } })
    expect(posted.status, JSON.stringify(posted.data)).toBe(201)
    const line = (await todayLines()).find(l => l.includes(`on ${code} missed its start`))
    expect(line).toMatch(/missed its start at ((Mon|Tue|Wed|Thu|Fri|Sat|Sun) \d{1,2} [A-Z][a-z]{2} \d{4} )?([01]\d|2[0-3]):[0-5]\d:/)
    expect(line).not.toMatch(/\d{4}-\d{2}-\d{2}|[AP]M/)
  })
})

describe('warnings stored on a pour', () => {
  it('are kept in kg and read in the workshop\'s units, on the pour and on the board', async () => {
    const mouldId = await fx.mould({ cavity_litres: 40 })
    const lotId = await fx.lot({ bags_received: 1 })
    const slotStart = '2027-05-11T08:00:00Z'
    const posted = await call('/api/pours', { method: 'POST', cookie: lead, body: { mouldId, lotId, slotStart } })
    expect(posted.status, JSON.stringify(posted.data)).toBe(201)
    const metricShort = (posted.data.warnings as string[]).find(w => w.includes('short'))
    const kg = Number(/([\d.]+) kg short/.exec(metricShort ?? '')?.[1])
    expect(kg).toBeGreaterThan(0)
    const stored = (await fx.k('pours').where({ id: posted.data.id }).first('warnings')).warnings as string[]
    expect(stored.join(' ')).toContain(`${metricShort}`)
    await settings({ units: 'imperial' })
    try {
      const board = await call('/api/board?from=2027-05-11&to=2027-05-11', { cookie: lead })
      const pour = expandBoardPours(board.data).find(p => p.id === posted.data.id)!
      const short = pour.warnings.find(w => w.includes('short'))!
      const lb = Number(/([\d.]+) lb short/.exec(short)?.[1])
      // kg ÷ 0.45359237 = lb (NIST SP 811), to the one decimal the warning is written with
      expect(lb).toBeCloseTo(kg / 0.45359237, 0)
      expect(pour.warnings.join(' ')).not.toMatch(/\bkg\b|°C/)
      const moved = await call(`/api/pours/${posted.data.id}`, { method: 'PATCH', cookie: lead, body: { version: posted.data.version, casterId: fx.casterId } })
      expect(moved.status, JSON.stringify(moved.data)).toBe(200)
      expect((moved.data.warnings as string[]).join(' ')).toMatch(/[\d.]+ lb short/)
    }
    finally {
      await settings({ units: 'metric' })
    }
  })
})

describe('the workshop\'s locale', () => {
  it('is saved, kept by a save that leaves it out, sent to the pages, and refused in other words', async () => {
    expect((await settings({ locale: 'en-US' })).locale).toBe('en-US')
    const { locale: _, ...withoutLocale } = (await call('/api/workshop', { cookie: lead })).data
    const kept = await call('/api/workshop', { method: 'PATCH', cookie: lead, body: withoutLocale })
    expect(kept.status).toBe(200)
    expect(kept.data.locale).toBe('en-US')
    expect((await call('/api/auth/me', { cookie: lead })).data.workshop.locale).toBe('en-US')
    const bad = await call('/api/workshop', { method: 'PATCH', cookie: lead, body: { ...kept.data, locale: 'xx-YY' } })
    expect(bad.status).toBe(422)
    expect(bad.data.data.problems[0]).toMatchObject({ field: 'locale' })
    expect(bad.data.data.problems[0].message).toContain('Date style')
    await settings({ locale: 'en-GB' })
  })
})
