// Browser journey: a caster opens the mix card, adds water, and sees the demould window move.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { openBrowser, screenshot, signInThroughForm, VIEWPORTS, gotoHydrated } from '../setup/browser'
import { DEMO_PASSWORD, DEMO_USERS } from '../../db/seeds/demo-people'
import { testContext } from '../setup/context'

const base = testContext().baseUrl
let browser: Awaited<ReturnType<typeof openBrowser>>
beforeAll(async () => {
  browser = await openBrowser(VIEWPORTS.tablet)
})
afterAll(async () => {
  await browser?.close()
})

describe('mix card', () => {
  it('moves the demould window when the consistency changes, with the set curve drawn', async () => {
    const caster = DEMO_USERS.find(u => u.key === 'caster1')!
    const page = await browser.context.newPage()
    await signInThroughForm(page, base, caster.email, DEMO_PASSWORD)
    await page.getByRole('heading', { level: 1, name: /My pours/ }).waitFor()
    await page.getByRole('link', { name: 'Mix card' }).click()
    await page.getByRole('heading', { level: 1, name: 'Mix card' }).waitFor()
    await page.getByLabel('Mould').selectOption({ label: 'CR-101 · Egg-and-dart cornice, 1.2 m length' })
    await page.getByLabel('Plaster grade').selectOption({ label: 'Fine casting (beta)' })
    const window = page.getByTestId('mix-window')
    const openAt = async () => Number((await window.textContent())!.split('–')[0])
    const before = await openAt()
    // the chart loads when its place is scrolled near (useSeen), not with the page
    await page.getByTestId('mix-chart').scrollIntoViewIfNeeded()
    await page.locator('canvas').waitFor()
    await screenshot(page, 'mix-card-consistency-70')
    await page.locator('#mix-consistency').fill('80')
    await expect.poll(openAt).toBeGreaterThan(before)
    await screenshot(page, 'mix-card-consistency-80')
    await page.close()
  })

  it('on a phone, draws the set curve only when its place is scrolled near', async () => {
    const page = await browser.context.newPage()
    await page.setViewportSize(VIEWPORTS.phone)
    await gotoHydrated(page, `${base}/mix`)
    await page.getByTestId('mix-window').waitFor()
    const box = page.getByTestId('mix-chart')
    // far below the first screen (useSeen loads it within 200 px of the viewport)
    expect((await box.boundingBox())!.y).toBeGreaterThan(VIEWPORTS.phone.height + 200)
    // once the page has fetched all it will, still no chart (a lazy chart would have come by now)
    await page.waitForLoadState('networkidle')
    expect(await page.locator('canvas').count()).toBe(0)
    await box.scrollIntoViewIfNeeded()
    await page.locator('canvas').waitFor()
    // its place was held: the chart fills the box that stood there
    expect((await box.boundingBox())!.height).toBeGreaterThan(200)
    await page.close()
  })
})
