// Browser journey for photos: a lead adds two photos to a job on the job page (with the upload
// progress bar), shares them, and the job's client, in another browser, sees them in the gallery
// on a phone and pages through them in the lightbox.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Page } from 'playwright-core'
import sharp from 'sharp'
import { openBrowser, screenshot, signInThroughForm, VIEWPORTS } from '../setup/browser'
import { DEMO_PASSWORD, closeTestDb, demo, demoWorkshopId, testDb } from '../setup/fixtures'
import { testContext } from '../setup/context'

const base = testContext().baseUrl
const uid = Math.random().toString(36).slice(2, 6).toUpperCase()
let staff: Awaited<ReturnType<typeof openBrowser>>
let client: Awaited<ReturnType<typeof openBrowser>>
let jobId = 0

beforeAll(async () => {
  staff = await openBrowser()
  client = await openBrowser(VIEWPORTS.phone)
  const ws = await demoWorkshopId()
  const k = testDb()
  const [job] = await k('jobs').insert({ workshop_id: ws, code: `P-${uid}`, title: 'Library ceiling', site: 'Reading room (invented)' }).returning('id')
  jobId = Number(job.id)
  const c = await k('users').where({ email: demo.client1.email }).first('id')
  await k('job_members').insert({ workshop_id: ws, job_id: jobId, user_id: c.id })
  await k('job_items').insert({ workshop_id: ws, job_id: jobId, description: 'Ceiling rose, 450 mm', quantity: 3, pieces_needed: 3 })
})
afterAll(async () => {
  await staff?.close()
  await client?.close()
  await closeTestDb()
})

const signIn = (page: Page, email: string, home: string) => signInThroughForm(page, base, email, DEMO_PASSWORD, home)

/** A picture with something to see: a warm plaster tone and a darker band. */
async function picture(tone: string) {
  const band = await sharp({ create: { width: 1600, height: 300, channels: 3, background: '#6b5a48' } }).png().toBuffer()
  return sharp({ create: { width: 1600, height: 1200, channels: 3, background: tone } }).composite([{ input: band, top: 450, left: 0 }]).jpeg().toBuffer()
}

describe('photos from the shop to the client', () => {
  it('a lead uploads and shares photos; the client opens them in the lightbox', async () => {
    const page = await staff.context.newPage()
    await signIn(page, demo.lead.email, '/lead')
    await page.goto(`${base}/lead/jobs/${jobId}`)
    await page.getByRole('heading', { name: 'Photos' }).waitFor()
    await page.locator('input[type=file][multiple]').setInputFiles([
      { name: 'rose-front.jpg', mimeType: 'image/jpeg', buffer: await picture('#e9dfcf') },
      { name: 'rose-side.jpg', mimeType: 'image/jpeg', buffer: await picture('#d8cbb4') },
    ])
    await page.getByText('2 chosen').waitFor()
    await page.getByLabel('Caption').fill('Ceiling rose out of the mould')
    await screenshot(page, 'photos-lead-chosen')
    await page.getByRole('button', { name: 'Upload 2 photos' }).click()
    await page.getByText('2 photos added.').waitFor()
    const cards = page.locator('[data-photo]')
    // the message shows when the upload answers; the grid fills when its refetch lands after it
    await cards.nth(1).waitFor()
    await expect(cards.count()).resolves.toBe(2)
    await expect(cards.first().getByText('Workshop only').isVisible()).resolves.toBe(true)
    for (const i of [0, 1]) {
      await cards.nth(i).getByRole('button', { name: 'Share', exact: true }).click()
      await cards.nth(i).getByText('Client sees it').waitFor()
    }
    await page.locator('[data-photo] img').first().evaluate((img: HTMLImageElement) => img.decode())
    await screenshot(page, 'photos-lead-shared')
    await page.close()

    const phone = await client.context.newPage()
    await signIn(phone, demo.client1.email, '/client')
    await phone.goto(`${base}/client/jobs/${jobId}`)
    await phone.getByRole('heading', { name: 'Photos' }).waitFor()
    await phone.getByText('not planned yet', { exact: false }).first().waitFor()
    await expect(phone.locator('[data-stage="planned"]').first().textContent()).resolves.toBe('0 / 3')
    const thumbs = phone.getByRole('button', { name: /Open photo: Ceiling rose out of the mould/ })
    await expect(thumbs.count()).resolves.toBe(2)
    await expect(phone.locator('img[loading="lazy"]').count()).resolves.toBe(2)
    await screenshot(phone, 'photos-client-gallery')
    await thumbs.first().click()
    const dialog = phone.getByRole('dialog', { name: 'Photo' })
    await dialog.waitFor()
    await dialog.getByText('1 of 2').waitFor()
    const shown = dialog.locator('img')
    await shown.evaluate((img: HTMLImageElement) => img.decode())
    await expect(shown.evaluate((img: HTMLImageElement) => img.naturalWidth)).resolves.toBe(1600)
    await screenshot(phone, 'photos-client-lightbox')
    await phone.keyboard.press('ArrowRight')
    await dialog.getByText('2 of 2').waitFor()
    await dialog.getByRole('button', { name: 'Next photo' }).click()
    await dialog.getByText('1 of 2').waitFor()
    await phone.keyboard.press('Escape')
    await dialog.waitFor({ state: 'hidden' })
    await phone.close()
  })
})
