// Browser journey: a caster opens the mix card, adds water, and sees the demould window move.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { openBrowser, screenshot, signInThroughForm, VIEWPORTS } from '../setup/browser'
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
    await page.locator('canvas').waitFor()
    await screenshot(page, 'mix-card-consistency-70')
    await page.locator('#mix-consistency').fill('80')
    await expect.poll(openAt).toBeGreaterThan(before)
    await screenshot(page, 'mix-card-consistency-80')
    await page.close()
  })
})
