// Browser journey: each demo role signs in through the form and lands on its own home.
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest'
import { openBrowser, screenshot, submitSignIn, VIEWPORTS, gotoHydrated } from '../setup/browser'
import { DEMO_PASSWORD, DEMO_USERS } from '../../db/seeds/demo-people'
import { testContext } from '../setup/context'

const base = testContext().baseUrl
let browser: Awaited<ReturnType<typeof openBrowser>>

beforeAll(async () => {
  browser = await openBrowser()
})
afterAll(async () => {
  await browser?.close()
})
beforeEach(async () => {
  await browser.context.clearCookies()
})

const HOMES = [
  { key: 'lead', path: '/lead', heading: /Today at Larkspur/, viewport: VIEWPORTS.desktop },
  { key: 'caster1', path: '/floor', heading: /My pours today/, viewport: VIEWPORTS.tablet },
  { key: 'finisher', path: '/finishing', heading: /Finishing/, viewport: VIEWPORTS.tablet },
  { key: 'client1', path: '/client', heading: /My jobs/, viewport: VIEWPORTS.phone },
] as const

describe('sign in as each role', () => {
  for (const h of HOMES) {
    it(`${h.key} lands on ${h.path}`, async () => {
      const user = DEMO_USERS.find(u => u.key === h.key)!
      const page = await browser.context.newPage()
      await page.setViewportSize(h.viewport)
      await submitSignIn(page, base, user.email, DEMO_PASSWORD)
      await page.waitForURL(`${base}${h.path}`)
      // the URL changes before the new page has rendered: wait for its heading
      await page.getByRole('heading', { level: 1, name: h.heading }).waitFor()
      await expect(page.getByTestId('user-name').textContent()).resolves.toBe(user.name)
      // the live connection comes up over socket.io on the same port
      await page.locator('[data-testid="live-status"][data-status="online"]').waitFor()
      await screenshot(page, `sign-in-${h.key}-home`)
      // a page of another role sends this user back home
      await gotoHydrated(page, `${base}${h.key === 'lead' ? '/client' : '/lead'}`)
      await page.waitForURL(`${base}${h.path}`)
      await page.getByRole('button', { name: 'Sign out' }).click()
      await page.waitForURL(/\/login/)
      await page.close()
    })
  }

  it('shows the server\'s message for a wrong password', async () => {
    const page = await browser.context.newPage()
    await submitSignIn(page, base, DEMO_USERS[0].email, 'definitely-wrong')
    await expect(page.getByTestId('login-error').textContent()).resolves.toMatch(/E-mail or password is wrong/)
    await screenshot(page, 'sign-in-wrong-password')
    await page.close()
  })

  it('sends a signed-out visitor to sign-in', async () => {
    const page = await browser.context.newPage()
    await page.goto(`${base}/lead/people`)
    await page.waitForURL(/\/login\?next=/)
    await page.close()
  })
})
