// Browser journeys on the board's week: a pour dragged across days and one moved with the
// keyboard alone (the server confirms where each landed), the shift's breaks drawn on the ruler
// and down the lanes, job codes on one line at fit-to-width, the timeline's height held before
// it mounts, no serious axe-core violation; the week the server draws before any script runs
// (the bars where the calendar then draws them); and the board in the workshop's units (imperial).
import { afterAll, afterEach, beforeAll, describe, expect, it } from 'vitest'
import type { Page } from 'playwright-core'
import { openBrowser, screenshot, signInThroughForm } from '../setup/browser'
import { seriousAxeViolations } from '../setup/axe'
import { DEMO_PASSWORD, closeTestDb, demo, testDb } from '../setup/fixtures'
import { testContext } from '../setup/context'
import { call, saveWorkshopSettings, signIn } from '../setup/http'
import { leanPour } from '#shared/utils/board-lean'
import type { BoardPourRow } from '#shared/types/board'

const base = testContext().baseUrl
let browser: Awaited<ReturnType<typeof openBrowser>>
let leadCookie = ''
// Monday 6 March 2028, London on GMT: local wall clock = UTC; this file's database is its own
const MONDAY = '2028-03-06'
const addDays = (day: string, n: number) => new Date(Date.parse(`${day}T12:00:00Z`) + n * 86_400_000).toISOString().slice(0, 10)
const BREAKS = [{ start: '10:00', end: '10:15' }, { start: '12:30', end: '13:00' }]

const saveWorkshop = (patch: Record<string, unknown>) => saveWorkshopSettings(leadCookie, patch)

beforeAll(async () => {
  browser = await openBrowser({ width: 1280, height: 900 })
  leadCookie = await signIn(demo.lead.email, DEMO_PASSWORD)
  await saveWorkshop({ shiftBreaks: BREAKS })
})
afterAll(async () => {
  await browser?.close()
  await closeTestDb()
})
afterEach(async () => {
  await browser?.context.clearCookies()
})

/** A pour of the demo's corbel job on CB-12, planned through the API. */
async function plannedPour(slotStart: string) {
  const k = testDb()
  const mould = await k('moulds').where({ code: 'CB-12' }).first('id')
  const item = await k('job_items').join('jobs', 'jobs.id', 'job_items.job_id').where({ 'jobs.code': 'J-2603' }).first('job_items.id')
  const r = await call('/api/pours', { method: 'POST', cookie: leadCookie, body: { mouldId: Number(mould.id), jobItemId: Number(item.id), slotStart } })
  expect(r.status).toBe(201)
  return r.data as { id: number; mouldId: number; jobCode: string }
}

/** Where the server says a pour starts (the board's wire row by name: t[0] in epoch ms). */
async function serverStart(id: number, from: string, to: string) {
  const board = (await call(`/api/board?from=${from}&to=${to}`, { cookie: leadCookie })).data as { pours: BoardPourRow[] }
  const p = board.pours.map(leanPour).find(x => x.id === id)
  return p ? new Date(p.t[0]!).toISOString() : null
}

async function openBoard(query: string) {
  const page = await browser.context.newPage()
  await signInThroughForm(page, base, demo.lead.email, DEMO_PASSWORD)
  await page.goto(`${base}/lead/board?${query}`)
  await page.getByRole('heading', { level: 1, name: 'Pour board' }).waitFor()
  return page
}

async function expectMessage(page: Page, pattern: RegExp) {
  await expect.poll(async () => (await page.getByTestId('board-message').textContent({ timeout: 1000 }).catch(() => '')) ?? '', { timeout: 10_000 }).toMatch(pattern)
}

describe('the board\'s week', () => {
  it('moves a pour across days by drag and by keyboard, draws the breaks, keeps codes on one line, passes axe', async () => {
    const dragged = await plannedPour(`${MONDAY}T09:00:00.000Z`)
    const keyed = await plannedPour(`${addDays(MONDAY, 1)}T14:00:00.000Z`)
    await plannedPour(`${addDays(MONDAY, 3)}T08:00:00.000Z`)
    const page = await openBoard(`view=week&date=${MONDAY}&zoom=1`)
    const bar = page.locator(`[data-testid="pour-bar"][data-pour-id="${dragged.id}"]`)
    await bar.waitFor()

    // the height held for the timeline before it mounted is the height it drew (within 10 %)
    const heights = await page.getByTestId('board-frame').evaluate((el) => {
      const rem = Number.parseFloat(getComputedStyle(document.documentElement).fontSize)
      return { held: Number.parseFloat((el as HTMLElement).style.minHeight) * rem, drawn: el.querySelector<HTMLElement>('.setline-board:not(.board-sketch)')!.offsetHeight }
    })
    expect(heights.held / heights.drawn).toBeGreaterThan(0.9)
    expect(heights.held / heights.drawn).toBeLessThan(1.1)

    // the breaks: on the ruler where they fall, and as bands down the lanes
    await expect.poll(() => page.getByTestId('ruler-break').count()).toBeGreaterThan(0)
    expect(await page.getByTestId('ruler-break').evaluateAll(els => [...new Set(els.map(e => e.getAttribute('title')))])).toEqual(['Break 10:00–10:15', 'Break 12:30–13:00'])
    expect(await page.locator('.fc-bg-event.shift-break').count()).toBeGreaterThan(0)

    // fit to width: each job code on one line, the full code in the bar's title
    const codes = await page.getByTestId('pour-code').evaluateAll(els => els.map((el) => {
      const e = el as HTMLElement
      return { text: e.textContent, lines: Math.round(e.offsetHeight / Number.parseFloat(getComputedStyle(e).lineHeight)), title: e.closest('[title]')?.getAttribute('title') ?? '' }
    }))
    expect(codes.length).toBe(3)
    for (const c of codes) {
      expect(c.lines).toBe(1)
      expect(c.title.startsWith('J-2603 ·')).toBe(true)
      expect('J-2603').toContain(c.text)
    }
    await screenshot(page, 'board-week-breaks-codes')
    expect(await seriousAxeViolations(page)).toEqual([])

    // drag Monday's bar to Wednesday on the same mould: the week's slots are an hour wide
    const box = (await bar.boundingBox())!
    const wed = page.locator(`.fc-timeline-slot-lane[data-date^="${addDays(MONDAY, 2)}T09:00"]`).first()
    const slot = (await wed.boundingBox())!
    const from = { x: box.x + 4, y: box.y + box.height / 2 }
    await page.mouse.move(from.x, from.y)
    await page.mouse.down()
    await page.mouse.move(from.x + 5, from.y + 2, { steps: 3 })
    await page.mouse.move(slot.x + 4, from.y, { steps: 15 })
    await page.mouse.up()
    await expectMessage(page, /^Moved J-2603 to CB-12 at 09:00/)
    expect(await serverStart(dragged.id, MONDAY, addDays(MONDAY, 7))).toBe(`${addDays(MONDAY, 2)}T09:00:00.000Z`)
    await expect.poll(() => bar.evaluate(el => el.closest('.fc-timeline-event')!.getBoundingClientRect().x)).toBeCloseTo(slot.x, -1)

    // the keyboard alone: the list's Move button, the dialog's fields, Enter to move
    await page.getByRole('button', { name: /^Move pour J-2603 on CB-12 at Tue 7 Mar 2028 14:00/ }).focus()
    await page.keyboard.press('Enter')
    const dialog = page.getByRole('dialog', { name: 'J-2603 on CB-12' })
    await dialog.waitFor()
    expect(await seriousAxeViolations(page)).toEqual([])
    await dialog.locator('#move-day').fill(addDays(MONDAY, 4))
    // (typed digits would meet the browser's own 12-hour segments: the value is set, Enter submits)
    await dialog.locator('#move-time').fill('11:00')
    await dialog.locator('#move-time').press('Enter')
    await expectMessage(page, /^Moved J-2603 to CB-12 at 11:00/)
    expect(await serverStart(keyed.id, MONDAY, addDays(MONDAY, 7))).toBe(`${addDays(MONDAY, 4)}T11:00:00.000Z`)
    await expect.poll(() => page.locator(`[data-testid="pour-bar"][data-pour-id="${keyed.id}"]`).count()).toBe(1)
    await screenshot(page, 'board-week-moved')
    await page.close()
  }, 120_000)

  it('draws the week on the server before any script runs, each bar where the calendar then draws it', async () => {
    const week = addDays(MONDAY, 28)
    const tue = await plannedPour(`${addDays(week, 1)}T09:00:00.000Z`)
    const thu = await plannedPour(`${addDays(week, 3)}T13:00:00.000Z`)
    const query = `view=week&date=${week}&zoom=1`
    // no script at all: what the server sent is a board to read
    const [name, value] = leadCookie.split(';')[0]!.split('=') as [string, string]
    const bare = await browser.context.browser()!.newContext({ javaScriptEnabled: false, viewport: { width: 1280, height: 900 } })
    await bare.addCookies([{ name, value, url: base }])
    const still = await bare.newPage()
    await still.goto(`${base}/lead/board?${query}`)
    const sketched = await still.getByTestId('board-sketch').locator('[data-p]').evaluateAll(els => els.map((e) => {
      const r = e.getBoundingClientRect()
      return { id: Number((e as HTMLElement).dataset.p), text: e.textContent, x: r.x, width: r.width, planned: e.classList.contains('pour-planned') }
    }))
    expect(sketched.map(s => s.id).sort((a, b) => a - b)).toEqual([tue.id, thu.id].sort((a, b) => a - b))
    for (const s of sketched) expect(s).toMatchObject({ text: '2603planned', planned: true })
    // hidden from assistive technology: a picture of the board until the calendar comes
    expect(await still.getByTestId('board-sketch').getAttribute('aria-hidden')).toBe('true')
    const sketchDays = await still.locator('.sk-day-label').allTextContents()
    expect(sketchDays[0]).toBe('Mon 3 Apr')
    await screenshot(still, 'board-week-sketch')
    await bare.close()

    // with scripts: the calendar draws each bar where the sketch had it, then the sketch goes
    const page = await openBoard(query)
    for (const s of sketched) {
      const bar = page.locator(`[data-testid="pour-bar"][data-pour-id="${s.id}"]`)
      await bar.waitFor()
      const box = await bar.evaluate(el => el.closest('.fc-timeline-event')!.getBoundingClientRect().toJSON() as DOMRect)
      expect(Math.abs(box.x - s.x), `bar ${s.id} at ${box.x}, sketched at ${s.x}`).toBeLessThan(3)
      expect(Math.abs(box.width - s.width)).toBeLessThan(3)
    }
    await expect.poll(() => page.getByTestId('board-sketch').count()).toBe(0)
    // the calendar's ruler names the days as the sketch did (the house's day style)
    const calendarDays = await page.locator('.setline-board .ruler-text').allTextContents()
    expect(calendarDays.slice(0, sketchDays.length)).toEqual(sketchDays)
    await page.close()
  }, 60_000)

  it('plans no mix into a break of the shift', async () => {
    const day = addDays(MONDAY, 7)
    const r = await call('/api/planner/preview', { method: 'POST', cookie: leadCookie, body: { from: day, to: addDays(day, 4) } })
    expect(r.status).toBe(200)
    const pours = r.data.pours as { mixAt: string }[]
    expect(pours.length).toBeGreaterThan(0)
    // gauging takes 5 minutes (the planner's default); GMT, so the wall clock is the UTC one
    const clock = (hhmm: string) => Number(hhmm.slice(0, 2)) * 60 + Number(hhmm.slice(3, 5))
    for (const p of pours) {
      const mix = clock(p.mixAt.slice(11, 16))
      for (const b of BREAKS) expect(mix < clock(b.end) && clock(b.start) < mix + 5, `mix at ${p.mixAt}`).toBe(false)
    }
  }, 60_000)

  it('shows the shop temperature and the pour\'s batch in the workshop\'s units', async () => {
    const pour = await plannedPour(`${addDays(MONDAY, 14)}T09:00:00.000Z`)
    const ws = await saveWorkshop({ units: 'imperial' })
    const page = await openBoard(`view=day&date=${addDays(MONDAY, 14)}`)
    await page.locator(`[data-testid="pour-bar"][data-pour-id="${pour.id}"]`).waitFor()
    const shown = Number(await page.getByLabel('Shop °F').inputValue())
    expect(shown).toBeCloseTo(ws.defaultShopTempC * 1.8 + 32, 1) // °F = 1.8 × °C + 32 (NIST SP 811)
    await page.getByRole('button', { name: /^Move pour J-2603 on CB-12/ }).click()
    const batch = await page.getByTestId('pour-batch').textContent()
    expect(batch).toMatch(/^\d+\.\d\d lb plaster, \d+\.\d\d lb water$/)
    // (the warnings stored on pours are still written in kg: the toolbar and the batch are checked)
    expect(await page.locator('main').innerText()).not.toMatch(/°C/)
    await screenshot(page, 'board-imperial')
    await page.close()
    await saveWorkshop({ units: 'metric' })
  }, 60_000)
})
