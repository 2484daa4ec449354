// Browser journeys for the installable floor app: the service worker keeps /floor and
// /finishing, so a tablet reloads them with the network off and shows its cards from its own
// copy; a photo taken offline waits in the outbox (IndexedDB) and lands exactly once when the
// network returns; signing out deletes the page copies.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { BrowserContext, Page } from 'playwright-core'
import sharp from 'sharp'
import { VIEWPORTS, openBrowser, screenshot, signInThroughForm } from '../setup/browser'
import { DEMO_PASSWORD, closeTestDb, demo } from '../setup/fixtures'
import { boardFixture, zoneAwayFromMidnight } from '../setup/board-fixtures'
import { testContext } from '../setup/context'
import { seriousAxeViolations } from '../setup/axe'

const base = testContext().baseUrl
let browser: Awaited<ReturnType<typeof openBrowser>>
let fx: Awaited<ReturnType<typeof boardFixture>>

beforeAll(async () => {
  browser = await openBrowser(VIEWPORTS.tablet, { serviceWorkers: 'allow' })
  fx = await boardFixture('offline-e2e')
  await fx.k('workshops').where({ id: fx.workshopId }).update({ timezone: zoneAwayFromMidnight() })
})
afterAll(async () => {
  await browser?.close()
  await closeTestDb()
})

async function cookieOf(email: string) {
  const r = await fetch(`${base}/api/auth/login`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ email, password: DEMO_PASSWORD }) })
  return r.headers.getSetCookie().find(c => c.startsWith('setline-session='))!.split(';')[0]!
}

/** A pour planned for caster 1 starting a few minutes ago on a fresh mould. */
async function pourNow() {
  const jobId = await fx.job()
  const itemId = await fx.item(jobId, null)
  const mouldId = await fx.mould()
  const slotStart = new Date(Math.floor(Date.now() / 60_000) * 60_000 - 5 * 60_000).toISOString()
  const r = await fetch(`${base}/api/pours`, { method: 'POST', headers: { 'content-type': 'application/json', 'cookie': await cookieOf(demo.lead.email) }, body: JSON.stringify({ mouldId, slotStart, jobItemId: itemId, casterId: fx.casterId }) })
  expect(r.status).toBe(201)
  return { ...(await r.json()) as { id: number; mouldCode: string }, jobId }
}

const card = (page: Page, id: number) => page.locator(`[data-testid="floor-card"][data-pour-id="${id}"]`)

/**
 * Whether the service worker itself can reach the server: the offline switch must hold for
 * the worker's own fetches too, or a "reload offline" would quietly be answered by the network.
 */
async function workerReachesServer(context: BrowserContext) {
  const [worker] = context.serviceWorkers()
  return worker!.evaluate(() => fetch('/api/health', { cache: 'no-store' }).then(() => true, () => false))
}

/** Signs in, opens `path` and waits until the service worker controls the page, then reloads once so the worker keeps the page. */
async function openUnderWorker(page: Page, email: string, path: string, ready: (p: Page) => Promise<void>) {
  await page.context().clearCookies()
  await signInThroughForm(page, base, email, DEMO_PASSWORD)
  await page.goto(`${base}${path}`)
  await ready(page)
  await page.waitForFunction(() => navigator.serviceWorker.controller !== null, undefined, { timeout: 30_000 })
  // the first visit was fetched before the worker existed: this reload goes through it
  await page.reload()
  await ready(page)
}

describe('the floor app offline', () => {
  it('reloads /floor with the network off and shows today\'s cards; a photo taken offline lands once', async () => {
    const p = await pourNow()
    const page = await browser.context.newPage()
    const floorReady = (pg: Page) => card(pg, p.id).waitFor()
    await openUnderWorker(page, demo.caster1.email, '/floor', floorReady)
    const meKey = 'Offline check, first name'
    await fx.k('workshops').where({ id: fx.workshopId }).update({ name: meKey })
    // the worker's copy now holds the page as read with the first name (network first while online)
    await page.reload()
    await floorReady(page)

    // demoulded online, so the card offers a photo of its piece
    await card(page, p.id).getByTestId('floor-next').click()
    await card(page, p.id).getByLabel('Water °C').fill('18')
    await card(page, p.id).getByTestId('floor-submit').click()
    await expect.poll(() => card(page, p.id).getAttribute('data-state'), { timeout: 15_000 }).toBe('mixing')
    await card(page, p.id).getByTestId('floor-next').click()
    await card(page, p.id).getByLabel('Shop °C').fill('17')
    await card(page, p.id).getByTestId('floor-submit').click()
    await expect.poll(() => card(page, p.id).getAttribute('data-state'), { timeout: 15_000 }).toBe('setting')
    await card(page, p.id).getByTestId('floor-next').click()
    await card(page, p.id).getByTestId('ask-confirm').click()
    await card(page, p.id).getByText('Sound', { exact: true }).click()
    await card(page, p.id).getByTestId('floor-submit').click()
    await expect.poll(() => card(page, p.id).textContent(), { timeout: 15_000 }).toMatch(/Piece .*#001/)
    // the server's answer is in the cards' offline copy before the network goes
    await page.reload()
    await expect.poll(() => card(page, p.id).textContent(), { timeout: 15_000 }).toMatch(/Piece .*#001/)

    await fx.k('workshops').where({ id: fx.workshopId }).update({ name: 'Offline check, second name' })
    await browser.context.setOffline(true)
    try {
      expect(await workerReachesServer(browser.context)).toBe(false)
      await page.reload()
      await card(page, p.id).waitFor()
      await page.getByTestId('floor-offline').waitFor()
      // the page came from the worker's copy: the server would have sent the second name
      const payload = await page.locator('#__NUXT_DATA__').textContent()
      expect(payload).toContain(meKey)
      expect(payload).not.toContain('second name')
      await screenshot(page, 'offline-floor-reloaded')
      expect(await seriousAxeViolations(page)).toEqual([])

      await card(page, p.id).getByRole('button', { name: 'Photo of this piece' }).click()
      const jpeg = await sharp({ create: { width: 800, height: 600, channels: 3, background: '#ddd3c2' } }).jpeg().toBuffer()
      await card(page, p.id).locator('input[type=file]').first().setInputFiles({ name: 'offline.jpg', mimeType: 'image/jpeg', buffer: jpeg })
      await card(page, p.id).getByLabel('Caption').fill('Taken with the Wi-Fi down')
      await card(page, p.id).getByRole('button', { name: 'Upload photo' }).click()
      await expect.poll(() => card(page, p.id).getByTestId('floor-photo-waiting').textContent()).toMatch(/1 photo of .*#001 waiting to send/)
      // kept in IndexedDB, not only in the page: it survives a reload without the network
      await page.reload()
      await expect.poll(() => card(page, p.id).getByTestId('floor-photo-waiting').textContent()).toMatch(/1 photo of .*#001 waiting to send/)
      await screenshot(page, 'offline-floor-photo-waiting')
    }
    finally {
      await browser.context.setOffline(false)
    }
    await expect.poll(() => card(page, p.id).getByTestId('floor-photo').textContent(), { timeout: 30_000 }).toMatch(/1 photo added to .*#001/)
    const lead = await cookieOf(demo.lead.email)
    const photos = async () => (await (await fetch(`${base}/api/jobs/${p.jobId}/photos`, { headers: { cookie: lead } })).json()) as { caption: string | null }[]
    expect((await photos()).map(x => x.caption)).toEqual(['Taken with the Wi-Fi down'])
    // a further round of sending (the retry timer, a reconnect) stores nothing again
    await page.evaluate(() => window.dispatchEvent(new Event('online')))
    await expect.poll(() => page.getByTestId('outbox-pending').textContent()).toMatch(/All (your )?actions sent/)
    expect((await photos()).length).toBe(1)
    await page.close()
  }, 180_000)

  it('reloads /finishing with the network off; signing out deletes the page copies', async () => {
    const page = await browser.context.newPage()
    const ready = (pg: Page) => pg.getByRole('heading', { level: 1 }).waitFor()
    await openUnderWorker(page, demo.finisher.email, '/finishing', ready)
    await expect.poll(() => page.evaluate(() => caches.open('setline-pages').then(c => c.keys()).then(k => k.map(r => new URL(r.url).pathname)))).toContain('/finishing')
    await browser.context.setOffline(true)
    try {
      await page.reload()
      await ready(page)
      await page.getByTestId('finishing-offline').waitFor()
      await screenshot(page, 'offline-finishing-reloaded')
    }
    finally {
      await browser.context.setOffline(false)
    }
    await page.reload()
    await ready(page)
    await page.getByRole('button', { name: 'Sign out' }).click()
    await page.waitForURL(/\/(login|tablet)/)
    expect(await page.evaluate(() => caches.has('setline-pages'))).toBe(false)
    await page.close()
  }, 120_000)
})
