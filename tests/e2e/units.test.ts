// Imperial everywhere: with the workshop switched to lb / US gal / °F / in through the settings
// API, every page each role reads shows no metric unit (kg, L, °C, mm, m) unless both scales are
// written on purpose ("49 °C (120 °F)"). The board is left to its own change (it takes these
// helpers after it lands); the lead's Today is walked with lots and pours that put figures and
// days on it. Also: the day sheet opens on the
// workshop's own day and prints with its name and shop temperature.
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest'
import type { Page } from 'playwright-core'
import { openBrowser, screenshot, signInThroughForm, gotoHydrated } from '../setup/browser'
import { DEMO_PASSWORD, closeTestDb, demo, testDb } from '../setup/fixtures'
import { testContext } from '../setup/context'
import { call, saveWorkshopSettings, signIn } from '../setup/http'

const base = testContext().baseUrl
let browser: Awaited<ReturnType<typeof openBrowser>>
let leadCookie = ''

beforeAll(async () => {
  browser = await openBrowser()
  leadCookie = await signIn(demo.lead.email, DEMO_PASSWORD)
  await saveWorkshopSettings(leadCookie, { units: 'imperial' })
})
afterAll(async () => {
  await browser?.close()
  await closeTestDb()
})
beforeEach(async () => {
  await browser.context.clearCookies()
})

/** Both scales side by side, written on purpose: '49 °C (120 °F)' or '120 °F (49 °C)'. */
const BOTH = /-?\d+(\.\d+)?\s?°C \(-?\d+(\.\d+)? °F\)|-?\d+(\.\d+)?\s?°F \(-?\d+(\.\d+)? °C\)/g
/** A metric unit after a figure, or as a column or field label. */
const METRIC = /\d\s?(kg|L|mm|m)\b|°C|\bkg\b|kg\/L|\(L\)|, L\b|\(m\)|, m\b|\(mm\)/

/** The workshop's own words (what a mould casts, typed by the lead) are theirs, not Setline's units. */
let ownWords: string[] = []

async function metricOn(page: Page, path: string) {
  await gotoHydrated(page, `${base}${path}`)
  await page.locator('main').waitFor()
  // the settings' choice between the two systems names both on purpose
  let text = (await page.locator('main').innerText()).replace(BOTH, '').replace('Metric (kg, L, °C, m)', '')
  for (const words of ownWords) text = text.split(words).join('')
  const lines = text.split('\n').filter(l => METRIC.test(l))
  return lines
}

async function walk(page: Page, paths: string[]) {
  const found: Record<string, string[]> = {}
  for (const path of paths) {
    const lines = await metricOn(page, path)
    if (lines.length) found[path] = lines
  }
  return found
}

describe('a workshop on imperial', () => {
  it('shows no metric unit on the pages the lead reads', async () => {
    const k = testDb()
    const job = await k('jobs').orderBy('id').first('id')
    const mould = await k('moulds').orderBy('id').first('id')
    const dispatch = await k('dispatches').orderBy('id').first('id')
    ownWords = (await k('moulds').select('casts')).map(m => m.casts as string).sort((a, b) => b.length - a.length)
    const page = await browser.context.newPage()
    await signInThroughForm(page, base, demo.lead.email, DEMO_PASSWORD, '/lead')
    // a lot down to its last bag and one past its use-by: Today names their stock and date
    const gradeId = (await k('plaster_grades').orderBy('id').first('id')).id
    const workshopId = (await k('workshops').orderBy('id').first('id')).id
    await k('plaster_lots').insert([
      { workshop_id: workshopId, grade_id: gradeId, lot_code: 'UNITS-SHORT', bags_received: 1, bag_kg: 25, received_on: '2026-01-01' },
      { workshop_id: workshopId, grade_id: gradeId, lot_code: 'UNITS-STALE', bags_received: 10, bag_kg: 25, received_on: '2026-01-01', use_by: '2026-01-02' },
    ])
    const paths = ['/lead', '/lead/jobs', `/lead/jobs/${job.id}`, `/lead/jobs/${job.id}/register`, '/lead/moulds', `/lead/moulds/${mould.id}`,
      '/lead/plasters', '/lead/lots', '/lead/quality', '/lead/settings', `/loads/${job.id}`, '/day-sheet?day=2027-04-21', '/day-sheet', '/mix', '/cautions', '/account',
      ...(dispatch ? [`/dispatches/${dispatch.id}`] : [])]
    const found = await walk(page, paths)
    await screenshot(page, 'units-imperial-last-lead-page')
    expect(found).toEqual({})
    await gotoHydrated(page, `${base}/lead`)
    // 25 kg = 55 lb in whole pounds (NIST SP 811); 2 Jan 2026 is a Friday (Gregorian calendar)
    await page.getByText('Lot UNITS-SHORT is running short: 55 lb left').waitFor()
    await page.getByText('Lot UNITS-STALE is past its use-by date (Fri 2 Jan 2026)').waitFor()
  }, 240_000)

  it('takes the usual temperature and the heaviest crate in imperial units and labels the mix card\'s cavity in US gal', async () => {
    const page = await browser.context.newPage()
    await signInThroughForm(page, base, demo.lead.email, DEMO_PASSWORD, '/lead')
    await gotoHydrated(page, `${base}/lead/settings`)
    const temp = page.getByLabel('Usual shop temperature (°F)')
    const shown = Number(await temp.inputValue())
    const stored = (await call('/api/workshop', { cookie: leadCookie })).data.defaultShopTempC
    expect(shown).toBeCloseTo(stored * 1.8 + 32, 1) // °F = 1.8 × °C + 32 (NIST SP 811)
    // the heaviest crate typed in lb, kept in kg (1 lb = 0.45359237 kg exactly, NIST SP 811)
    const crate = page.getByLabel('Heaviest crate (lb)')
    const crateKg = (await call('/api/workshop', { cookie: leadCookie })).data.crateMaxKg
    expect(Number(await crate.inputValue())).toBeCloseTo(crateKg / 0.45359237, 1)
    const save = page.getByRole('button', { name: 'Save settings' })
    // refused in the browser in the form's words, its bounds in lb: 10 kg = 22.05 lb, shown rounded inwards
    await crate.fill('20')
    await save.click()
    await expect(page.locator('form').getByRole('alert').textContent()).resolves.toBe('Heaviest crate must be between 22.1 and 4409.2 lb')
    await crate.fill('400')
    await save.click()
    await page.getByText('Settings saved').waitFor()
    // 400 lb × 0.45359237 = 181.436948 kg, kept to the column's three decimals
    expect((await call('/api/workshop', { cookie: leadCookie })).data.crateMaxKg).toBe(181.437)
    expect(Number(await crate.inputValue())).toBe(400)
    await page.goto(`${base}/mix`)
    await page.getByLabel('Cavity (US gal)').waitFor()

    // the grade form's temperature factors: typed in °F, kept in °C
    await gotoHydrated(page, `${base}/lead/plasters`)
    await page.getByRole('button', { name: 'Edit' }).first().click()
    const form = page.getByRole('form', { name: 'Plaster grade' })
    const name = (await form.getByRole('heading').innerText()).replace(/^Edit /, '')
    const grade = await testDb()('plaster_grades').where({ name }).first('id')
    const factors = form.getByLabel(/Temperature factors/)
    // 20 °C, where every grade's factor is 1, is 68 °F (°F = 1.8 × °C + 32, NIST SP 811)
    expect(await factors.inputValue()).toContain('68:1')
    expect(await form.innerText()).not.toMatch(/°C/)
    await factors.fill('50:1.6, 68:1, 86:0.7')
    await form.getByRole('button', { name: 'Save grade' }).click()
    // °C = (°F − 32) / 1.8 (NIST SP 811): 50 °F = 10 °C, 86 °F = 30 °C
    await expect.poll(async () => (await testDb()('plaster_grades').where({ id: grade.id }).first('temperature_factors')).temperature_factors)
      .toEqual([[10, 1.6], [20, 1], [30, 0.7]])
  }, 120_000)

  it('shows no metric unit on the caster\'s floor and the finisher\'s room', async () => {
    const caster = await browser.context.newPage()
    await signInThroughForm(caster, base, demo.caster1.email, DEMO_PASSWORD)
    expect(await walk(caster, ['/floor', '/day-sheet'])).toEqual({})
    await browser.context.clearCookies()
    const finisher = await browser.context.newPage()
    await signInThroughForm(finisher, base, demo.finisher.email, DEMO_PASSWORD)
    expect(await walk(finisher, ['/finishing'])).toEqual({})
  }, 120_000)

  it('prints the day sheet with the workshop, its day and shop temperature, and boxes to write in', async () => {
    const page = await browser.context.newPage()
    await signInThroughForm(page, base, demo.lead.email, DEMO_PASSWORD, '/lead')
    await gotoHydrated(page, `${base}/day-sheet`)
    const head = await page.getByTestId('sheet-head').innerText()
    expect(head).toContain('Larkspur Ornamental Plaster')
    expect(head).toMatch(/shop \d+\.\d °F/)
    await page.emulateMedia({ media: 'print' })
    const boxes = page.locator('td.write-in')
    if (await boxes.count()) expect(await boxes.first().isVisible()).toBe(true)
    await expect.poll(() => page.locator('header').first().isVisible()).toBe(false)
    await screenshot(page, 'day-sheet-print')
  })
})
