// Browser journey from the packing bay to the client: on a tablet a lead packs two ready pieces
// into a crate (its weight summed), books a delivery, and on site the delivery is signed for with
// a photo of the load and a signature drawn on the pad with the mouse; then the client, on a
// phone, sees it delivered with the signed note. axe on every new page.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { VIEWPORTS, openBrowser, screenshot, signInThroughForm } from '../setup/browser'
import { DEMO_PASSWORD, closeTestDb, demo } from '../setup/fixtures'
import { finishingFixture } from '../setup/finishing-fixtures'
import { testContext } from '../setup/context'
import { jpegWithGps } from '../setup/photo-fixtures'
import { seriousAxeViolations } from '../setup/axe'

const base = testContext().baseUrl
let tablet: Awaited<ReturnType<typeof openBrowser>>
let phone: Awaited<ReturnType<typeof openBrowser>>
let fx: Awaited<ReturnType<typeof finishingFixture>>
beforeAll(async () => {
  tablet = await openBrowser(VIEWPORTS.tablet)
  phone = await openBrowser(VIEWPORTS.phone)
  fx = await finishingFixture('deliv-e2e')
})
afterAll(async () => {
  await tablet?.close()
  await phone?.close()
  await closeTestDb()
})

describe('pack, deliver, sign, follow', () => {
  it('packs into a crate, books and signs for the delivery on a tablet; the client sees it delivered', async () => {
    const jobId = await fx.job({ title: 'Orangery cornice' })
    const client = await fx.k('users').where({ email: demo.client1.email }).first('id')
    await fx.k('job_members').insert({ workshop_id: fx.workshopId, job_id: jobId, user_id: client.id })
    const itemId = await fx.item(jobId, null)
    const a = await fx.piece({ itemId, slotStart: '2031-07-01T09:00:00Z' })
    const b = await fx.piece({ itemId, slotStart: '2031-07-02T09:00:00Z' })
    // stood ready: the finishing steps have journeys of their own
    await fx.k('pieces').whereIn('id', [a.id, b.id]).update({ state: 'ready' })

    const page = await tablet.context.newPage()
    await signInThroughForm(page, base, demo.lead.email, DEMO_PASSWORD)
    await page.goto(`${base}/loads/${jobId}`)
    await page.locator('html[data-hydrated]').waitFor()
    await page.getByLabel(a.mark, { exact: false }).check()
    await page.getByLabel(b.mark, { exact: false }).check()
    await page.getByTestId('pack').click()
    const crate = page.locator('[data-crate]').first()
    await crate.waitFor()
    const kg = (a.dryMassKg + b.dryMassKg).toFixed(2) // masses in the house style: two decimals
    await expect.poll(() => crate.getByTestId('crate-kg').textContent()).toContain(kg)
    expect(await seriousAxeViolations(page)).toEqual([])
    await screenshot(page, 'loads-packed')

    await page.getByTestId('delivery-day').fill('2031-07-20')
    await page.getByTestId('vehicle').fill('Flatbed 2')
    await page.getByRole('checkbox', { name: /Crate C1/ }).check()
    await page.getByTestId('book').click()
    const link = page.getByRole('link', { name: /Flatbed 2/ })
    await link.waitFor()
    await link.click()
    await page.waitForURL(/\/deliveries\/\d+$/)
    await page.locator('html[data-hydrated]').waitFor()
    expect(await seriousAxeViolations(page)).toEqual([])

    await page.getByTestId('pod-photo').setInputFiles({ name: 'load.jpg', mimeType: 'image/jpeg', buffer: await jpegWithGps(320, 240) })
    await page.getByTestId('receiver').fill('Olwen Trescothick')
    const pad = (await page.getByTestId('signature').boundingBox())!
    await page.mouse.move(pad.x + 30, pad.y + pad.height / 2)
    await page.mouse.down()
    for (let i = 1; i <= 12; i++) await page.mouse.move(pad.x + 30 + i * 25, pad.y + pad.height / 2 + (i % 2 ? -30 : 30), { steps: 3 })
    await page.mouse.up()
    await page.getByTestId('sign').click()
    await page.getByTestId('signed').waitFor()
    expect(await page.getByTestId('signed').textContent()).toContain('Olwen Trescothick')
    expect(await seriousAxeViolations(page)).toEqual([])
    await screenshot(page, 'delivery-signed')
    const row = await fx.k('deliveries').where({ job_id: jobId }).first()
    expect(row.state).toBe('delivered')
    expect(row.photo_id).toBeTruthy()
    // a drawn signature, not an empty pad: a PNG of some size
    expect(row.signature_png.length).toBeGreaterThan(500)
    expect(row.signature_png.subarray(1, 4).toString()).toBe('PNG')
    await page.close()

    const mobile = await phone.context.newPage()
    await signInThroughForm(mobile, base, demo.client1.email, DEMO_PASSWORD)
    await mobile.goto(`${base}/client/jobs/${jobId}`)
    const list = mobile.getByTestId('client-deliveries')
    await list.waitFor()
    await expect.poll(() => list.locator('[data-state="delivered"]').count()).toBe(1)
    expect(await list.textContent()).toContain('Olwen Trescothick')
    expect(await list.getByRole('link', { name: /Signed delivery note/ }).count()).toBe(1)
    expect(await seriousAxeViolations(mobile)).toEqual([])
    await screenshot(mobile, 'client-delivered')
    await mobile.close()
  }, 180_000)
})
