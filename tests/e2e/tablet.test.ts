// The shared tablet on a tablet-sized screen (820×1180): the lead signs the device in as a
// shared tablet, a caster switches in with the keypad and sees the floor, then "Switch
// person" hands the tablet to the finisher, who sees the fettling queue. Screenshots per step;
// axe on the picker, the keypad and every page of the caster switched in by PIN.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Page } from 'playwright-core'
import { VIEWPORTS, openBrowser, screenshot, signInThroughForm, gotoHydrated } from '../setup/browser'
import { call, signIn } from '../setup/http'
import { DEMO_PASSWORD, closeTestDb, demo, testDb } from '../setup/fixtures'
import { seriousAxeViolations } from '../setup/axe'
import { testContext } from '../setup/context'

const base = testContext().baseUrl
const PINS = { caster: '3958', finisher: '8163' }
let browser: Awaited<ReturnType<typeof openBrowser>>

beforeAll(async () => {
  browser = await openBrowser(VIEWPORTS.tablet)
  // each gives themselves a PIN on their profile, as they would on /account
  for (const [u, pin] of [[demo.caster1, PINS.caster], [demo.finisher, PINS.finisher]] as const) {
    const r = await call('/api/me/pin', { method: 'PUT', cookie: await signIn(u.email, DEMO_PASSWORD), body: { pin, password: DEMO_PASSWORD } })
    expect(r.status, JSON.stringify(r.data)).toBe(200)
  }
})
afterAll(async () => {
  await browser?.close()
  await testDb()('rate_limits').where('key', 'like', 'pin%').del()
  await closeTestDb()
})

async function typePin(page: Page, pin: string) {
  const keypad = page.getByTestId('tablet-keypad')
  for (const d of pin) await keypad.getByRole('button', { name: d, exact: true }).click()
}

async function switchIn(page: Page, name: string, pin: string) {
  await page.getByRole('button', { name: new RegExp(name) }).click()
  await page.getByRole('heading', { level: 1, name: `PIN for ${name}` }).waitFor()
  await typePin(page, pin)
  await page.getByTestId('tablet-ok').click()
}

describe('shared tablet', () => {
  it('the lead signs the tablet in, a caster switches in and sees the floor, then the finisher the fettling queue', async () => {
    const page = await browser.context.newPage()
    // the app asks in its own dialog: a native confirm() here would fail the journey
    const native: string[] = []
    page.on('dialog', (d) => {
      native.push(d.message())
      void d.dismiss()
    })

    await signInThroughForm(page, base, demo.lead.email, DEMO_PASSWORD, '/lead')
    await gotoHydrated(page, `${base}/lead/people`)
    await page.getByLabel('Name for this device').fill('Casting shop tablet')
    await screenshot(page, 'tablet-1-lead-people')
    await page.getByRole('button', { name: 'Use this device as a shared tablet' }).click()
    const ask = page.getByRole('dialog', { name: 'Make this device a shared tablet?' })
    await ask.waitFor()
    await expect(ask.textContent()).resolves.toContain('"Casting shop tablet"')
    await expect.poll(() => page.evaluate(() => document.activeElement?.closest('dialog')?.getAttribute('data-testid'))).toBe('ask-dialog')
    await screenshot(page, 'tablet-1b-ask')
    await ask.getByRole('button', { name: 'Make it a shared tablet' }).click()
    await page.waitForURL(`${base}/tablet`)
    expect(native).toEqual([])
    await page.getByRole('heading', { level: 1, name: 'Who is working?' }).waitFor()
    await expect.poll(() => page.getByTestId('tablet-name').textContent()).toContain('Casting shop tablet')
    // the lead's session on this device has ended; leads are not on the picker
    expect((await page.request.get(`${base}/api/auth/me`)).status()).toBe(401)
    await expect.poll(() => page.getByRole('button', { name: /Morwenna Castellan/ }).count()).toBe(0)
    const tile = page.getByRole('button', { name: new RegExp(demo.caster1.name) })
    expect((await tile.boundingBox())!.height).toBeGreaterThanOrEqual(48)
    await screenshot(page, 'tablet-2-picker')
    expect(await seriousAxeViolations(page)).toEqual([])

    await page.getByRole('button', { name: new RegExp(demo.caster1.name) }).click()
    await typePin(page, PINS.caster.slice(0, 2))
    const ok = await page.getByTestId('tablet-ok').boundingBox()
    expect(ok!.height).toBeGreaterThanOrEqual(64)
    expect((await page.getByTestId('tablet-keypad').getByRole('button', { name: '5', exact: true }).boundingBox())!.height).toBeGreaterThanOrEqual(64)
    await screenshot(page, 'tablet-3-keypad')
    expect(await seriousAxeViolations(page)).toEqual([])
    await typePin(page, PINS.caster.slice(2))
    await page.getByTestId('tablet-ok').click()
    await page.waitForURL(`${base}/floor`)
    await page.getByRole('heading', { level: 1, name: 'My pours today' }).waitFor()
    await expect.poll(() => page.getByText('Loading today\'s pours').count()).toBe(0)
    await expect.poll(() => page.getByTestId('user-name').textContent()).toBe(demo.caster1.name)
    await expect.poll(() => page.getByTestId('user-role').textContent()).toContain('Casting shop tablet')
    await screenshot(page, 'tablet-4-caster-floor')
    // the caster switched in by PIN walks their pages: axe finds nothing serious on any
    for (const path of ['/floor', '/day-sheet', '/mix', '/cautions', '/account', '/floor']) {
      await gotoHydrated(page, `${base}${path}`)
      await page.locator('main').waitFor()
      expect(await seriousAxeViolations(page), path).toEqual([])
    }
    await expect.poll(() => page.getByTestId('user-name').textContent()).toBe(demo.caster1.name)

    await page.getByTestId('switch-person').click()
    await page.waitForURL(`${base}/tablet`)
    await page.getByRole('heading', { level: 1, name: 'Who is working?' }).waitFor()
    expect((await page.request.get(`${base}/api/auth/me`)).status()).toBe(401)
    // opened afresh (a reload, the home address), the tablet still shows its picker
    await page.goto(`${base}/`)
    await page.waitForURL(`${base}/tablet`)
    await page.locator('html[data-hydrated]').waitFor()
    await page.getByRole('heading', { level: 1, name: 'Who is working?' }).waitFor()

    // a mistyped PIN says so and clears the dots; the right one goes through
    await switchIn(page, demo.finisher.name, '8164')
    await expect.poll(() => page.getByTestId('tablet-error').textContent()).toMatch(/PIN is not right/)
    await screenshot(page, 'tablet-5-wrong-pin')
    await typePin(page, PINS.finisher)
    await page.getByTestId('tablet-ok').click()
    await page.waitForURL(`${base}/finishing`)
    await page.getByRole('heading', { level: 1, name: 'Finishing' }).waitFor()
    await expect.poll(() => page.getByTestId('user-name').textContent()).toBe(demo.finisher.name)
    await screenshot(page, 'tablet-6-finisher-queue')

    // a lead may still sign in on the tablet with their password; signing out returns to the picker
    await page.getByTestId('switch-person').click()
    await page.waitForURL(`${base}/tablet`)
    await signInThroughForm(page, base, demo.lead.email, DEMO_PASSWORD, '/lead')
    await gotoHydrated(page, `${base}/lead/people`)
    await expect.poll(() => page.getByTestId('tablets').getByText('this device', { exact: true }).count()).toBe(1)
    await page.getByRole('button', { name: 'Sign out' }).click()
    await page.waitForURL(`${base}/tablet`)
    await page.getByRole('heading', { level: 1, name: 'Who is working?' }).waitFor()
    await page.close()
  }, 180_000)

  it('a caster sets a PIN on their account page: an easy one is refused beside the field', async () => {
    const page = await browser.context.newPage()
    await browser.context.clearCookies()
    await signInThroughForm(page, base, demo.caster2.email, DEMO_PASSWORD, '/floor')
    await gotoHydrated(page, `${base}/account`)
    const form = page.getByTestId('pin-form')
    await form.getByLabel('PIN', { exact: true }).or(form.getByLabel('New PIN')).fill('1234')
    await form.getByLabel('PIN again').fill('1234')
    await form.getByLabel('Your password').fill(DEMO_PASSWORD)
    await form.getByRole('button', { name: /Set PIN|Change PIN/ }).click()
    await expect.poll(() => form.locator('#pin-new-error').textContent()).toMatch(/run of digits/)
    await screenshot(page, 'tablet-7-account-pin-refused')
    await form.getByLabel('PIN', { exact: true }).or(form.getByLabel('New PIN')).fill('27194')
    await form.getByLabel('PIN again').fill('27194')
    await form.getByRole('button', { name: /Set PIN|Change PIN/ }).click()
    await expect.poll(() => form.getByRole('status').textContent()).toMatch(/PIN (set|changed)/)
    await expect.poll(() => page.getByTestId('pin-status').textContent()).toContain('You have a PIN')
    await screenshot(page, 'tablet-8-account-pin-set')
    await page.close()
  })
})
