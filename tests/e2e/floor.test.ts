// Browser journeys on the caster's tablet (820×1180): a caster starts mixing, marks poured
// and demoulded on a card (with a photo of the piece) while the lead's board follows live; then, offline, three steps
// wait in the outbox and land exactly once when the Wi-Fi comes back.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Page } from 'playwright-core'
import sharp from 'sharp'
import { VIEWPORTS, openBrowser, screenshot, signInThroughForm } from '../setup/browser'
import { DEMO_PASSWORD, closeTestDb, demo } from '../setup/fixtures'
import { boardFixture } from '../setup/board-fixtures'
import { testContext } from '../setup/context'

const base = testContext().baseUrl
let browser: Awaited<ReturnType<typeof openBrowser>>
let fx: Awaited<ReturnType<typeof boardFixture>>
beforeAll(async () => {
  browser = await openBrowser(VIEWPORTS.tablet)
  fx = await boardFixture('floor-e2e')
})
afterAll(async () => {
  await browser?.close()
  await closeTestDb()
})

/** A pour planned for caster 1 starting this minute on a fresh mould (today, whatever the clock says). */
async function pourNow() {
  const jobId = await fx.job()
  const itemId = await fx.item(jobId, null)
  const mouldId = await fx.mould()
  const slotStart = new Date(Math.floor(Date.now() / 60_000) * 60_000 - 5 * 60_000).toISOString()
  const lead = await fetch(`${base}/api/auth/login`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ email: demo.lead.email, password: DEMO_PASSWORD }) })
  const cookie = lead.headers.getSetCookie().find(c => c.startsWith('setline-session='))!.split(';')[0]!
  const r = await fetch(`${base}/api/pours`, { method: 'POST', headers: { 'content-type': 'application/json', cookie }, body: JSON.stringify({ mouldId, slotStart, jobItemId: itemId, casterId: fx.casterId }) })
  expect(r.status).toBe(201)
  return (await r.json()) as { id: number; mouldCode: string }
}

async function signInAs(page: Page, email: string) {
  await page.context().clearCookies()
  await signInThroughForm(page, base, email, DEMO_PASSWORD)
}

const card = (page: Page, id: number) => page.locator(`[data-testid="floor-card"][data-pour-id="${id}"]`)

/** Opens the card's next action, fills the form and records it. */
async function step(page: Page, id: number, fill: (p: Page) => Promise<void>) {
  await card(page, id).getByTestId('floor-next').click()
  await fill(page)
  await card(page, id).getByTestId('floor-submit').click()
}
const startMixing = (page: Page, id: number) => step(page, id, async () => {
  await card(page, id).getByLabel('Water °C').fill('18')
})
const poured = (page: Page, id: number) => step(page, id, async () => {
  await card(page, id).getByLabel('Shop °C').fill('17')
})
const demoulded = (page: Page, id: number) => step(page, id, async () => {
  await card(page, id).getByText('Sound', { exact: true }).click()
})
const stateOf = (page: Page, id: number) => card(page, id).getAttribute('data-state')

describe('floor', () => {
  it('a caster takes a pour from mixing to demoulded while the lead\'s board follows live', async () => {
    const p = await pourNow()
    const leadCtx = await openBrowser({ width: 1600, height: 1000 })
    try {
      const board = await leadCtx.context.newPage()
      await signInAs(board, demo.lead.email)
      await board.goto(`${base}/lead/board`)
      await board.getByRole('heading', { level: 1, name: 'Pour board' }).waitFor()
      const barState = () => board.locator(`[data-testid="pour-bar"][data-pour-id="${p.id}"] .pour-state`).first().textContent({ timeout: 2000 }).catch(() => '')
      await expect.poll(barState, { timeout: 15_000 }).toMatch(/planned/i)

      const page = await browser.context.newPage()
      await signInAs(page, demo.caster1.email)
      await page.goto(`${base}/floor`)
      await card(page, p.id).waitFor()
      await screenshot(page, 'floor-card-planned')
      await startMixing(page, p.id)
      await expect.poll(() => stateOf(page, p.id), { timeout: 15_000 }).toBe('mixing')
      await expect.poll(barState, { timeout: 15_000 }).toMatch(/mixing/i)
      await poured(page, p.id)
      await expect.poll(() => stateOf(page, p.id), { timeout: 15_000 }).toBe('setting')
      await expect.poll(barState, { timeout: 15_000 }).toMatch(/setting/i)
      await expect(card(page, p.id).getByTestId('floor-countdown').getAttribute('data-phase')).resolves.toBe('setting')
      await screenshot(page, 'floor-card-setting')
      await demoulded(page, p.id)
      await expect.poll(() => stateOf(page, p.id), { timeout: 15_000 }).toBe('demoulded')
      await expect.poll(barState, { timeout: 15_000 }).toMatch(/demoulded/i)
      await expect.poll(() => card(page, p.id).textContent(), { timeout: 15_000 }).toMatch(/Piece .*-001/)
      // a photo of the piece just out of the mould, from the tablet
      await card(page, p.id).getByRole('button', { name: 'Photo of this piece' }).click()
      const jpeg = await sharp({ create: { width: 800, height: 600, channels: 3, background: '#e8e1d4' } }).jpeg().toBuffer()
      await card(page, p.id).locator('input[type=file]').first().setInputFiles({ name: 'demould.jpg', mimeType: 'image/jpeg', buffer: jpeg })
      await card(page, p.id).getByLabel('Caption').fill('Straight out of the mould')
      await card(page, p.id).getByRole('button', { name: 'Upload photo' }).click()
      await expect.poll(() => card(page, p.id).getByTestId('floor-photo').textContent(), { timeout: 15_000 }).toMatch(/1 photo added to .*-001/)
      const piece = await fx.k('pieces').where({ pour_id: p.id }).first('id')
      expect(await fx.k('photos').where({ piece_id: piece.id }).pluck('caption')).toEqual(['Straight out of the mould'])
      await page.setViewportSize({ width: 1180, height: 820 })
      await screenshot(page, 'floor-card-demoulded-landscape')
      await screenshot(board, 'floor-lead-board-live')
      await page.close()
    }
    finally {
      await leadCtx.close()
    }
  }, 120_000)

  it('offline: three steps wait in the outbox and land once when the connection returns', async () => {
    const p = await pourNow()
    const page = await browser.context.newPage()
    await signInAs(page, demo.caster1.email)
    await page.goto(`${base}/floor`)
    await card(page, p.id).waitFor()
    await browser.context.setOffline(true)
    await startMixing(page, p.id)
    await expect.poll(() => stateOf(page, p.id)).toBe('mixing')
    await poured(page, p.id)
    await expect.poll(() => stateOf(page, p.id)).toBe('setting')
    await demoulded(page, p.id)
    await expect.poll(() => stateOf(page, p.id)).toBe('demoulded')
    await expect.poll(() => page.getByTestId('outbox-pending').textContent()).toMatch(/3 waiting/)
    await screenshot(page, 'floor-offline-outbox')
    await browser.context.setOffline(false)
    await expect.poll(() => page.getByTestId('outbox-pending').textContent(), { timeout: 30_000 }).toMatch(/All actions sent/)
    const row = await fx.k('pours').where({ id: p.id }).first('state', 'version')
    expect(row).toEqual({ state: 'demoulded', version: 4 })
    const types = await fx.k('events').where({ entity: 'pour', entity_id: String(p.id) }).orderBy('id').pluck('type')
    expect(types).toEqual(['pour.planned', 'pour.mixing', 'pour.poured', 'pour.demoulded'])
    expect(await fx.k('pieces').where({ pour_id: p.id }).count({ n: '*' })).toEqual([{ n: '1' }])
    await page.getByTestId('outbox-toggle').click()
    await screenshot(page, 'floor-outbox-history')
    await page.close()
  }, 120_000)
})
