// Browser journeys on the pour board: the lead creates a pour on an empty slot, drags it
// to another mould, is refused a clash, then runs the planner and accepts its plan; plans a
// week in the week view (working days, shift hours, kept in the URL), previews the planner
// over it, pages the board forward and back and accepts exactly what was previewed; and
// reads the refusal that names the proposal which can no longer be placed.
import { afterAll, afterEach, beforeAll, describe, expect, it } from 'vitest'
import type { Locator, Page } from 'playwright-core'
import { openBrowser, screenshot, signInThroughForm, gotoHydrated } from '../setup/browser'
import { DEMO_PASSWORD, DEMO_USERS } from '../../db/seeds/demo-people'
import { testContext } from '../setup/context'
import { formatDay } from '#shared/utils/workshop-format'
import { boardFixture } from '../setup/board-fixtures'
import { closeTestDb } from '../setup/fixtures'
import { leanPour } from '#shared/utils/board-lean'
import type { BoardPourRow } from '#shared/types/board'

const base = testContext().baseUrl
let browser: Awaited<ReturnType<typeof openBrowser>>
beforeAll(async () => {
  browser = await openBrowser({ width: 1600, height: 1000 })
})
afterAll(async () => {
  await browser?.close()
  await closeTestDb()
})
// each journey signs in afresh: a session left from the one before would skip the sign-in form
afterEach(async () => {
  await browser?.context.clearCookies()
})

/**
 * A Monday in 2028: the demo lives around today, the API tests book 2027, 2029 and from 2030
 * on; a different week on each run so a rerun on the same database finds it quiet too.
 */
function quietMonday() {
  const d = new Date(Date.UTC(2028, 0, 3) + (Math.floor(Date.now() / 1000) % 50) * 7 * 86_400_000)
  return d.toISOString().slice(0, 10)
}

async function resourceId(page: Page, code: string) {
  const cell = page.locator('.fc-datagrid-cell[data-resource-id]', { hasText: code }).first()
  return (await cell.getAttribute('data-resource-id'))!
}

/** The point on a mould's lane at a wall-clock time of the shown day. */
async function pointAt(page: Page, code: string, clock: string, offsetMin = 0) {
  const lane = page.locator(`.fc-timeline-lane[data-resource-id="${await resourceId(page, code)}"]`).first()
  const slot = page.locator(`.fc-timeline-slot-lane[data-date*="T${clock}"]`).first()
  // other tests add moulds to the demo workshop: the row may be off screen. Centre it: at the
  // very top of the window the calendar's sticky time header would take the mouse instead
  await lane.evaluate(el => el.scrollIntoView({ block: 'center' }))
  const [l, s] = [await lane.boundingBox(), await slot.boundingBox()]
  return { x: s!.x + 2 + (s!.width * offsetMin) / 15, y: l!.y + l!.height / 2 }
}

async function drag(page: Page, from: { x: number; y: number }, to: { x: number; y: number }) {
  await page.mouse.move(from.x, from.y)
  await page.mouse.down()
  await page.mouse.move(from.x + 5, from.y + 2, { steps: 3 })
  await page.mouse.move(to.x, to.y, { steps: 12 })
  await page.mouse.up()
}

/** Selects 09:00–09:30 on a mould's row to open the New pour dialog. */
async function selectSlot(page: Page, code: string) {
  await drag(page, await pointAt(page, code, '09:00'), await pointAt(page, code, '09:15', 14))
  await page.getByRole('dialog', { name: 'New pour' }).waitFor({ timeout: 5000 })
}

async function expectMessage(page: Page, pattern: RegExp) {
  await expect.poll(async () => (await page.getByTestId('board-message').textContent({ timeout: 1000 }).catch(() => '')) ?? '', { timeout: 10_000 }).toMatch(pattern)
}

/** Picks the first option whose text contains `text` (option labels carry counts that change). */
async function selectByText(select: Locator, text: string) {
  const value = await select.locator('option', { hasText: text }).first().getAttribute('value')
  await select.selectOption(value!)
}

const addDays = (day: string, n: number) => new Date(Date.parse(`${day}T12:00:00Z`) + n * 86_400_000).toISOString().slice(0, 10)

interface Previewed { jobItemId: number; mouldId: number; mouldCode: string; jobCode: string; slotStart: string }

async function signedInBoard(query: string) {
  const lead = DEMO_USERS.find(u => u.key === 'lead')!
  const page = await browser.context.newPage()
  await signInThroughForm(page, base, lead.email, DEMO_PASSWORD)
  await page.goto(`${base}/lead/board?${query}`)
  await page.getByRole('heading', { level: 1, name: 'Pour board' }).waitFor()
  return page
}

/** Previews the planner over from..to and returns the proposals the server answered with. */
async function previewPlan(page: Page, from: string, to: string) {
  await page.locator('#plan-from').fill(from)
  await page.locator('#plan-to').fill(to)
  const answer = page.waitForResponse(r => r.url().endsWith('/api/planner/preview'))
  await page.getByRole('button', { name: 'Preview plan' }).click()
  const body = await (await answer).json() as { pours: Previewed[] }
  await expect.poll(async () => (await page.getByTestId('plan-summary').textContent().catch(() => '')) ?? '', { timeout: 20_000 }).toMatch(/\d+ pours proposed/)
  return body.pours
}

describe('pour board', () => {
  it('Today lists what needs the lead, each line linking to where it is dealt with', async () => {
    const lead = DEMO_USERS.find(u => u.key === 'lead')!
    const page = await browser.context.newPage()
    await signInThroughForm(page, base, lead.email, DEMO_PASSWORD)
    await page.getByRole('heading', { level: 1, name: /Today/ }).waitFor()
    const links = page.locator('[data-testid="today-lines"] a')
    await links.first().waitFor()
    const hrefs = await links.evaluateAll(els => els.map(a => a.getAttribute('href') ?? ''))
    for (const href of hrefs) expect(href).toMatch(/^\/(lead\/board\?view=day&date=\d{4}-\d{2}-\d{2}|lead\/jobs\/\d+|lead\/lots|lead\/moulds\/\d+|finishing|lead\/mails)$/)
    // the demo's mould in repair: its line opens that mould
    const repair = page.getByRole('link', { name: /Mould PM-33 is waiting for repair/ })
    const href = await repair.getAttribute('href')
    await screenshot(page, 'today')
    await repair.click()
    await page.waitForURL(`${base}${href}`)
    await expect.poll(async () => (await page.getByRole('heading', { level: 1 }).textContent()) ?? '').toMatch(/PM-33/)
    await page.close()
  }, 60_000)

  it('names the proposal that can no longer be placed and writes nothing', async () => {
    const day = addDays(quietMonday(), 15)
    const page = await signedInBoard(`view=day&date=${day}`)
    await page.locator(`.fc-timeline-slot-lane[data-date^="${day}"]`).first().waitFor()
    const proposals = await previewPlan(page, day, day)
    expect(proposals.length).toBeGreaterThan(0)
    // someone else takes the first proposal's mould at its time meanwhile
    const first = proposals[0]!
    const taken = await page.request.post(`${base}/api/pours`, { headers: { origin: base }, data: { mouldId: first.mouldId, slotStart: first.slotStart } })
    expect(taken.status()).toBe(201)
    await page.getByRole('button', { name: 'Accept plan' }).click()
    await expect.poll(async () => (await page.getByTestId('plan-error').textContent().catch(() => '')) ?? '', { timeout: 10_000 })
      .toMatch(new RegExp(`^${first.jobCode} on ${first.mouldCode} at .+ can no longer be placed: This mould is already taken`))
    const board = await (await page.request.get(`${base}/api/board?from=${day}&to=${day}`)).json() as { pours: unknown[] }
    expect(board.pours).toHaveLength(1)
    await screenshot(page, 'board-plan-refused')
    await page.close()
  }, 120_000)

  it('creates, drags, refuses a clash, plans and accepts', async () => {
    const lead = DEMO_USERS.find(u => u.key === 'lead')!
    const page = await browser.context.newPage()
    await signInThroughForm(page, base, lead.email, DEMO_PASSWORD)
    await page.getByRole('heading', { level: 1, name: /Today/ }).waitFor()
    await gotoHydrated(page, `${base}/lead/board`)
    await page.getByRole('heading', { level: 1, name: 'Pour board' }).waitFor()
    const day = quietMonday()
    await page.locator('#board-date').fill(day)
    await page.locator(`.fc-timeline-slot-lane[data-date^="${day}"]`).first().waitFor()

    // create on an empty slot: select 09:00–09:30 on CB-12
    await selectSlot(page, 'CB-12')
    await selectByText(page.getByLabel('Job item'), 'J-2603 · Scroll corbels')
    await page.getByRole('button', { name: 'Put on the board' }).click()
    await expectMessage(page, /Planned J-2603 on CB-12 at 09:00/)
    const lane = page.locator(`.fc-timeline-lane[data-resource-id="${await resourceId(page, 'CB-12')}"]`)
    await expect.poll(() => lane.locator('[data-testid="pour-bar"]').count()).toBe(1)
    await screenshot(page, 'board-created')

    // drag the bar across to RS-05
    const target = await pointAt(page, 'RS-05', '09:00', 1) // may scroll: measure the bar after it
    const bar = await lane.locator('[data-testid="pour-bar"]').first().boundingBox()
    await drag(page, { x: bar!.x + 10, y: bar!.y + bar!.height / 2 }, target)
    await expectMessage(page, /Moved J-2603 to RS-05/)
    // the move's own live event patches the calendar: wait for the bar to stand on its new lane
    // (and leave CB-12's) so the next gesture does not start while the lanes are redrawn
    const rs05 = page.locator(`.fc-timeline-lane[data-resource-id="${await resourceId(page, 'RS-05')}"]`)
    await expect.poll(() => rs05.locator('[data-testid="pour-bar"]').count(), { timeout: 10_000 }).toBe(1)
    await expect.poll(() => lane.locator('[data-testid="pour-bar"]').count(), { timeout: 10_000 }).toBe(0)

    // a second pour on CB-12, then try to move it onto the first: refused with the reason
    await selectSlot(page, 'CB-12')
    await selectByText(page.getByLabel('Job item'), 'J-2603 · Scroll corbels')
    await page.getByRole('button', { name: 'Put on the board' }).click()
    await expectMessage(page, /Planned J-2603 on CB-12/)
    await page.getByRole('button', { name: /Move pour J-2603 on CB-12/ }).click()
    await selectByText(page.locator('#move-mould'), 'RS-05')
    await page.getByRole('button', { name: 'Move pour', exact: true }).click()
    await expect.poll(async () => await page.getByRole('dialog').getByRole('alert').textContent().catch(() => ''), { timeout: 10_000 }).toMatch(/taken|overlap/i)
    await screenshot(page, 'board-clash-refused')
    await page.getByRole('button', { name: 'Close' }).click()

    // the planner fills the day from open items; the lead accepts
    await page.locator('#plan-from').fill(day)
    await page.locator('#plan-to').fill(day)
    await page.getByRole('button', { name: 'Preview plan' }).click()
    await expect.poll(async () => (await page.getByTestId('plan-summary').textContent().catch(() => '')) ?? '', { timeout: 20_000 }).toMatch(/\d+ pours proposed/)
    const proposed = Number((await page.getByTestId('plan-summary').textContent())!.match(/(\d+) pours/)![1])
    expect(proposed).toBeGreaterThan(0)
    await screenshot(page, 'board-plan-preview')
    await page.getByRole('button', { name: 'Accept plan' }).click()
    await expectMessage(page, new RegExp(`Plan accepted: ${proposed} pours written`))
    await screenshot(page, 'board-plan-accepted')

    // the day sheet of that day lists the pours and what plaster to fetch
    await page.locator(`a[href="/day-sheet?day=${day}"]`).click()
    await page.getByRole('heading', { level: 1, name: `Day sheet ${formatDay(day, 'UTC')}` }).waitFor()
    await expect(page.getByTestId('requisition').textContent()).resolves.toMatch(/\d+ × 25 kg/)
    await screenshot(page, 'day-sheet')
    await page.close()
  }, 120_000)
  it('plans a week: working days in shift hours, kept in the URL, planner accepted after paging', async () => {
    const monday = addDays(quietMonday(), 7)
    // work of its own for the week: the day's plan above may have placed every demo item
    const fx = await boardFixture('week')
    await fx.item(await fx.job(), await fx.mould(), { pieces_needed: 12 })
    const page = await signedInBoard(`view=week&date=${monday}`)
    await page.setViewportSize({ width: 1280, height: 900 })
    await page.locator(`.fc-timeline-slot-lane[data-date^="${monday}"]`).first().waitFor()
    expect(await page.getByRole('button', { name: 'Week' }).getAttribute('aria-pressed')).toBe('true')
    // the demo works Monday to Friday from 07:30 to 16:00: no weekend and no night columns
    expect(await page.locator(`.fc-timeline-slot-lane[data-date^="${addDays(monday, 5)}"]`).count()).toBe(0)
    expect(await page.locator(`.fc-timeline-slot-lane[data-date^="${addDays(monday, 4)}T07:00"]`).count()).toBe(1)
    expect(await page.locator(`.fc-timeline-slot-lane[data-date^="${monday}T03:00"]`).count()).toBe(0)
    // the whole week fits 1280 px: no lane scrolls sideways
    const sideways = await page.locator('.setline-board .fc-scroller').evaluateAll(els => els.some(el => el.scrollWidth > el.clientWidth + 1))
    expect(sideways).toBe(false)
    await screenshot(page, 'board-week-1280')

    // a reload opens the same board
    await page.reload()
    await page.locator(`.fc-timeline-slot-lane[data-date^="${addDays(monday, 4)}"]`).first().waitFor()
    expect(await page.locator('#board-date').inputValue()).toBe(monday)
    expect(await page.getByRole('button', { name: 'Week' }).getAttribute('aria-pressed')).toBe('true')

    // the planner over the working week; then the board pages forward and back
    const proposals = await previewPlan(page, monday, addDays(monday, 4))
    expect(proposals.length).toBeGreaterThan(0)
    const summary = await page.getByTestId('plan-summary').textContent()
    await page.getByRole('button', { name: 'Later' }).click()
    await expect.poll(() => page.locator('#board-date').inputValue()).toBe(addDays(monday, 7))
    await page.getByRole('button', { name: 'Earlier' }).click()
    await expect.poll(() => page.locator('#board-date').inputValue()).toBe(monday)
    expect(await page.locator('#plan-from').inputValue()).toBe(monday)
    expect(await page.locator('#plan-to').inputValue()).toBe(addDays(monday, 4))
    expect(await page.getByTestId('plan-summary').textContent()).toBe(summary)
    await page.getByRole('button', { name: 'Accept plan' }).click()
    await expectMessage(page, new RegExp(`Plan accepted: ${proposals.length} pours written`))

    // every previewed pour landed where it was previewed
    // (the board's wire rows by name: t[0] is the slot's start in epoch ms)
    const board = await (await page.request.get(`${base}/api/board?from=${monday}&to=${addDays(monday, 7)}`)).json() as { pours: BoardPourRow[] }
    const landed = new Set(board.pours.map(leanPour).map(p => `${p.jobItemId}/${p.mouldId}/${p.t[0]}`))
    expect(proposals.filter(p => !landed.has(`${p.jobItemId}/${p.mouldId}/${Date.parse(p.slotStart)}`))).toEqual([])
    await screenshot(page, 'board-week-planned')

    // printed in black and white: the states differ by edge and word, not by colour alone
    await page.emulateMedia({ media: 'print' })
    // one bar dressed as each state in turn (the page is closed afterwards)
    const looks = await page.locator('.fc-timeline-event.pour').evaluateAll(els => els.slice(0, 1).map((el) => {
      const edge = (cls: string) => {
        el.setAttribute('class', `fc-timeline-event pour ${cls}`)
        const cs = getComputedStyle(el)
        return `${cs.borderTopStyle} ${cs.borderTopWidth} ${cs.backgroundColor}`
      }
      return { planned: edge('pour-planned'), mixing: edge('pour-mixing'), setting: edge('pour-setting'), overdue: edge('pour-setting pour-overdue') }
    }))
    const look = looks[0]!
    expect(new Set(Object.values(look)).size).toBe(4)
    // no fill colour in print: every state's bar is white paper
    for (const v of Object.values(look)) expect(v).toMatch(/rgb\(255, 255, 255\)$/)
    expect(await page.locator('.fc-timeline-event.pour .pour-state').first().textContent()).toMatch(/planned|mixing|setting|demoulded|overdue/)
    await page.emulateMedia({ media: 'screen' })
    await page.close()
  }, 120_000)
})
