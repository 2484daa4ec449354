// Browser journey on the tablets (820×1180): a caster demoulds a pour and prints its label (the
// print view shows the QR code, sized for the label printer's roll or an A4 sheet); a finisher
// scans that label on the finishing tablet and takes the piece's next step; the label's address
// opens the piece page; a lead revokes the label and a scan of it opens nothing and says so.
//
// The camera: the run's one chromium is shared by every browser file and launched once, so its
// fake-camera flags (--use-file-for-fake-video-capture) cannot carry this test's code. Instead the
// page's getUserMedia answers a canvas stream showing the QR code as the print view rendered it
// (a screenshot of the label's code on screen): the scanner's own path (video → canvas → jsQR)
// reads it, nothing of the decoding is skipped.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Page } from 'playwright-core'
import { VIEWPORTS, openBrowser, screenshot, signInThroughForm } from '../setup/browser'
import { DEMO_PASSWORD, closeTestDb, demo } from '../setup/fixtures'
import { boardFixture } from '../setup/board-fixtures'
import { testContext } from '../setup/context'
import { seriousAxeViolations } from '../setup/axe'
import { call, signIn } from '../setup/http'

const base = testContext().baseUrl
let browser: Awaited<ReturnType<typeof openBrowser>>
let fx: Awaited<ReturnType<typeof boardFixture>>

/** A zone where it is now between 04:00 and 20:00, so a pour of a few minutes ago is on the floor's local today. */
function zoneAwayFromMidnight(now = new Date()): string {
  const zones = ['Europe/London', 'America/New_York', 'America/Los_Angeles', 'Pacific/Honolulu', 'Asia/Kolkata', 'Asia/Tokyo', 'Australia/Brisbane']
  const hour = (zone: string) => Number(new Intl.DateTimeFormat('en-GB', { hour: '2-digit', hourCycle: 'h23', timeZone: zone }).format(now))
  return zones.find(z => hour(z) >= 4 && hour(z) < 20)!
}

beforeAll(async () => {
  browser = await openBrowser(VIEWPORTS.tablet)
  fx = await boardFixture('labels-e2e')
  await fx.k('workshops').where({ id: fx.workshopId }).update({ timezone: zoneAwayFromMidnight() })
})
afterAll(async () => {
  await browser?.close()
  await closeTestDb()
})

/** The camera this page gets: a canvas showing `png` (a data: URL), repainted so the stream keeps sending frames. */
async function fakeCamera(page: Page, png: string) {
  await page.addInitScript((src: string) => {
    const getUserMedia = async () => {
      const img = new Image()
      img.src = src
      await img.decode()
      const canvas = document.createElement('canvas')
      canvas.width = 640
      canvas.height = 480
      const ctx = canvas.getContext('2d')!
      const draw = () => {
        ctx.fillStyle = '#fff'
        ctx.fillRect(0, 0, 640, 480)
        ctx.drawImage(img, 140, 60, 360, 360)
      }
      draw()
      setInterval(draw, 100)
      return canvas.captureStream(10)
    }
    Object.defineProperty(navigator, 'mediaDevices', { configurable: true, value: { getUserMedia } })
  }, png)
}

const floorCard = (page: Page, id: number) => page.locator(`[data-testid="floor-card"][data-pour-id="${id}"]`)
const pieceCard = (page: Page, id: number) => page.locator(`[data-testid="piece-card"][data-piece-id="${id}"]`)

async function floorStep(page: Page, id: number, fill: () => Promise<void>) {
  await floorCard(page, id).getByTestId('floor-next').click()
  await fill()
  await floorCard(page, id).getByTestId('floor-submit').click()
}

describe('labels', () => {
  it('demould → print the label → scan it on the finishing tablet → fettle; a revoked label opens nothing', async () => {
    const job = await fx.job({ title: 'Morning room ceiling' })
    const item = await fx.item(job, null, { description: 'Morning room rose', pieces_needed: 1 })
    const slotStart = new Date(Math.floor(Date.now() / 60_000) * 60_000 - 5 * 60_000).toISOString()
    const lead = await signIn(demo.lead.email, DEMO_PASSWORD)
    const planned = await call('/api/pours', { method: 'POST', cookie: lead, body: { mouldId: await fx.mould(), slotStart, jobItemId: item, casterId: fx.casterId } })
    expect(planned.status).toBe(201)
    const pourId = planned.data.id as number

    // the caster demoulds on the floor (early: the card asks first) and prints the label
    const floor = await browser.context.newPage()
    await signInThroughForm(floor, base, demo.caster1.email, DEMO_PASSWORD)
    await floor.goto(`${base}/floor`)
    await floorCard(floor, pourId).waitFor()
    await floorStep(floor, pourId, () => floorCard(floor, pourId).getByLabel('Water °C').fill('18'))
    await expect.poll(() => floorCard(floor, pourId).getAttribute('data-state'), { timeout: 15_000 }).toBe('mixing')
    await floorStep(floor, pourId, () => floorCard(floor, pourId).getByLabel('Shop °C').fill('17'))
    await expect.poll(() => floorCard(floor, pourId).getAttribute('data-state'), { timeout: 15_000 }).toBe('setting')
    await floorStep(floor, pourId, async () => {
      await floorCard(floor, pourId).getByTestId('ask-confirm').click()
      await floorCard(floor, pourId).getByText('Sound', { exact: true }).click()
    })
    await floorCard(floor, pourId).getByTestId('floor-print-label').waitFor({ timeout: 15_000 })
    const piece = await fx.k('pieces').where({ pour_id: pourId }).first('id', 'mark')
    const pieceId = Number(piece.id)
    await screenshot(floor, 'labels-floor-demoulded')
    await floorCard(floor, pourId).getByTestId('floor-print-label').click()
    await floor.waitForURL(`${base}/labels?piece=${pieceId}`)
    const label = floor.getByTestId('piece-label')
    await label.waitFor()
    await expect(label.textContent()).resolves.toContain(piece.mark)
    await expect(label.textContent()).resolves.toContain('Morning room rose')
    const qr = label.getByTestId('label-qr')
    await expect.poll(() => qr.evaluate((img: HTMLImageElement) => img.complete && img.naturalWidth > 0)).toBe(true)
    const url = await label.getAttribute('data-url')
    expect(url).toMatch(new RegExp(`/pieces/${pieceId}\\?label=[\\w-]{22}$`))
    // the print view asks for the label printer's page, or A4 for the sheet (named CSS pages)
    await floor.emulateMedia({ media: 'print' })
    expect(await floor.getByTestId('labels').evaluate(el => getComputedStyle(el).getPropertyValue('page'))).toBe('label-roll')
    await floor.emulateMedia({ media: 'screen' })
    await floor.getByTestId('sheet-a4').check()
    await floor.emulateMedia({ media: 'print' })
    expect(await floor.getByTestId('labels').evaluate(el => getComputedStyle(el).getPropertyValue('page'))).toBe('label-a4')
    await floor.emulateMedia({ media: 'screen' })
    expect(await seriousAxeViolations(floor)).toEqual([])
    await screenshot(floor, 'labels-print-view')
    const png = `data:image/png;base64,${(await qr.screenshot()).toString('base64')}`
    await floor.close()

    // the finisher scans the label and takes its next step
    const tablet = await browser.context.newPage()
    await fakeCamera(tablet, png)
    await tablet.context().clearCookies()
    await signInThroughForm(tablet, base, demo.finisher.email, DEMO_PASSWORD, '/finishing')
    await tablet.getByRole('heading', { level: 1, name: 'Finishing' }).waitFor()
    await tablet.locator('html[data-hydrated]').waitFor()
    await tablet.getByTestId('scan-open').click()
    await expect.poll(() => pieceCard(tablet, pieceId).getAttribute('data-focused', { timeout: 2000 }).catch(() => null), { timeout: 20_000 }).toBe('true')
    await screenshot(tablet, 'labels-scanned')
    await pieceCard(tablet, pieceId).getByTestId('piece-next').click()
    await pieceCard(tablet, pieceId).getByTestId('finishing-submit').click()
    await tablet.getByTestId('tab-drying').click()
    await expect.poll(() => pieceCard(tablet, pieceId).getAttribute('data-state', { timeout: 2000 }).catch(() => null), { timeout: 15_000 }).toBe('drying')
    await expect.poll(async () => (await fx.k('pieces').where({ id: pieceId }).first('state')).state, { timeout: 15_000 }).toBe('drying')

    // the label's address opens the piece page
    await tablet.goto(url!)
    await tablet.getByTestId('piece-mark').waitFor()
    await expect(tablet.getByTestId('piece-mark').textContent()).resolves.toBe(piece.mark)
    await expect(tablet.getByTestId('piece-history').textContent()).resolves.toMatch(/Fettled, put to dry/)
    expect(await seriousAxeViolations(tablet)).toEqual([])
    await screenshot(tablet, 'labels-piece-page')

    // revoked by the lead, the label opens nothing: neither its address nor a scan
    expect((await call(`/api/pieces/${pieceId}/label/revoke`, { method: 'POST', cookie: lead })).data.revoked).toBe(1)
    await tablet.goto(url!)
    await expect(tablet.getByTestId('piece-label-refused').textContent()).resolves.toMatch(/revoked: it opens nothing/)
    expect(await tablet.getByTestId('piece-mark').count()).toBe(0)
    await tablet.goto(`${base}/finishing`)
    await tablet.locator('html[data-hydrated]').waitFor()
    await tablet.getByTestId('scan-open').click()
    await expect.poll(() => tablet.getByTestId('scan-problem').textContent({ timeout: 2000 }).catch(() => ''), { timeout: 20_000 }).toMatch(/revoked: it opens nothing/)
    await screenshot(tablet, 'labels-scan-revoked')
    await tablet.close()
  })
})
