// Browser journey for calendar links: a lead makes a link of the whole workshop on the settings
// page and one of a job on the job page, copies an address, and a calendar fetching each address
// gets an ICS with the job's booked delivery and fixing day; the lead revokes both on the screen
// (after saying yes in the app's own question box; a "Cancel" keeps the link) and each address
// then answers 404. axe on both pages.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Locator } from 'playwright-core'
import { openBrowser, screenshot, signInThroughForm, gotoHydrated } from '../setup/browser'
import { DEMO_PASSWORD, closeTestDb, demo } from '../setup/fixtures'
import { finishingFixture } from '../setup/finishing-fixtures'
import { testContext } from '../setup/context'
import { seriousAxeViolations } from '../setup/axe'
import { call } from '../setup/http'

const base = testContext().baseUrl
let staff: Awaited<ReturnType<typeof openBrowser>>
let fx: Awaited<ReturnType<typeof finishingFixture>>
let jobId = 0
let jobCode = ''

beforeAll(async () => {
  staff = await openBrowser()
  await staff.context.grantPermissions(['clipboard-read', 'clipboard-write'], { origin: base })
  fx = await finishingFixture('feeds')
  jobId = await fx.job()
  jobCode = (await fx.k('jobs').where({ id: jobId }).first('code')).code
  // a packed piece of the job, booked for delivery with a fixing day (the API test covers booking)
  const p = await fx.piece({ itemId: await fx.item(jobId, null), slotStart: '2031-05-06T09:00:00Z' })
  await fx.k('pieces').where({ id: p.id }).update({ state: 'packed' })
  const booked = await call(`/api/jobs/${jobId}/deliveries`, { method: 'POST', cookie: fx.lead, body: { deliveryDay: '2031-06-03', fixingOn: '2031-06-04', vehicle: 'Van 3', pieceIds: [p.id] } })
  if (booked.status !== 201) throw new Error(`booking the delivery failed: ${booked.status} ${JSON.stringify(booked.data)}`)
})
afterAll(async () => {
  await staff?.close()
  await closeTestDb()
})

/** What a phone's calendar gets from the address: fetched the way it would, with no session. */
const subscribe = (address: string) => fetch(`${base}${new URL(address).pathname}`)

/** Makes a link in the section and answers its address as the screen shows it. */
/** What a calendar reads at a live link: a 200 of text/calendar holding a VCALENDAR. */
async function calendarAt(address: string): Promise<string> {
  const feed = await subscribe(address)
  expect(feed.status).toBe(200)
  expect(feed.headers.get('content-type')).toContain('text/calendar')
  const ics = await feed.text()
  expect(ics).toContain('BEGIN:VCALENDAR')
  return ics
}

async function newLink(section: Locator): Promise<string> {
  const before = await section.getByTestId('feed-address').count()
  await section.getByRole('button', { name: 'New link' }).click()
  await section.getByText('New link made.').waitFor()
  await expect.poll(() => section.getByTestId('feed-address').count()).toBe(before + 1)
  const address = await section.getByTestId('feed-address').first().inputValue()
  expect(address).toMatch(/^https?:\/\/[^/]+\/api\/ics\/[\w-]{40,}\.ics$/)
  expect(await section.getByRole('link', { name: 'Subscribe on this device' }).first().getAttribute('href')).toBe(address.replace(/^https?:/, 'webcal:'))
  return address
}

/** Revokes the section's first live link through the question box. */
async function revokeFirst(section: Locator) {
  await section.getByTestId('feed-link').first().getByRole('button', { name: /^Revoke/ }).click()
  const dialog = section.getByTestId('ask-dialog')
  await dialog.getByText('Calendars subscribed to it stop getting deliveries and fixing days.', { exact: false }).waitFor()
  await dialog.getByRole('button', { name: 'Revoke link' }).click()
  await section.getByText('Link revoked: its address no longer opens.').waitFor()
}

describe('calendar links', () => {
  it('a lead makes a workshop link and a job link, a calendar reads them, and revoked they answer 404', async () => {
    const page = await staff.context.newPage()
    await signInThroughForm(page, base, demo.lead.email, DEMO_PASSWORD, '/lead')

    // the whole workshop, on the settings page
    await gotoHydrated(page, `${base}/lead/settings`)
    const shop = page.getByTestId('feed-links')
    await shop.getByRole('heading', { name: 'Calendar links' }).waitFor()
    await shop.getByText('No calendar links yet.').waitFor()
    const shopAddress = await newLink(shop)
    await expect(shop.getByTestId('feed-link').first().textContent()).resolves.toContain('Whole workshop')
    await shop.getByRole('button', { name: 'Copy address' }).click()
    await shop.getByText('Address copied.').waitFor()
    expect(await page.evaluate(() => navigator.clipboard.readText())).toBe(shopAddress)
    expect(await seriousAxeViolations(page)).toEqual([])
    await screenshot(page, 'calendar-links-workshop')

    const shopIcs = await calendarAt(shopAddress)
    expect(shopIcs).toContain(`Delivery ${jobCode}`)
    expect(shopIcs).toContain('DTSTART;VALUE=DATE:20310603')
    expect(shopIcs).toContain(`Fixing ${jobCode}`)

    // one job, on its page
    await gotoHydrated(page, `${base}/lead/jobs/${jobId}`)
    const job = page.getByTestId('feed-links')
    await job.getByRole('heading', { name: 'Calendar links' }).waitFor()
    // the workshop's link is listed on the settings page, not here
    await job.getByText('No calendar links yet.').waitFor()
    const jobAddress = await newLink(job)
    await expect(job.getByTestId('feed-link').first().textContent()).resolves.toContain(`Job ${jobCode}`)
    expect(await seriousAxeViolations(page)).toEqual([])
    await screenshot(page, 'calendar-links-job')
    const jobIcs = await calendarAt(jobAddress)
    expect(jobIcs).toContain(`Delivery ${jobCode}`)
    expect(jobIcs).toContain('DTSTART;VALUE=DATE:20310604')

    // "Cancel" in the question box keeps the link
    await job.getByTestId('feed-link').first().getByRole('button', { name: /^Revoke/ }).click()
    await job.getByTestId('ask-dialog').getByRole('button', { name: 'Cancel' }).click()
    await expect(job.getByTestId('ask-dialog').isVisible()).resolves.toBe(false)
    expect((await subscribe(jobAddress)).status).toBe(200)

    await revokeFirst(job)
    await job.getByText('No calendar links in use.').waitFor()
    await job.getByText('Revoked links (1)').waitFor()
    expect(await seriousAxeViolations(page)).toEqual([])
    expect((await subscribe(jobAddress)).status).toBe(404)
    expect((await subscribe(shopAddress)).status).toBe(200)

    // back on the settings page (a fresh load: the address is no longer shown, the link is)
    await gotoHydrated(page, `${base}/lead/settings`)
    await shop.getByTestId('feed-link').first().getByText('If it is lost, make a new link and revoke this one.', { exact: false }).waitFor()
    await expect(shop.getByTestId('feed-address').count()).resolves.toBe(0)
    await revokeFirst(shop)
    await shop.getByText('Revoked links (2)').waitFor()
    await shop.getByText('No calendar links in use.').waitFor()
    expect((await subscribe(shopAddress)).status).toBe(404)
    expect(await fx.k('calendar_feeds').where({ workshop_id: fx.workshopId }).whereNull('revoked_at').count('* as n').first()).toMatchObject({ n: '0' })
    await screenshot(page, 'calendar-links-revoked')
    await page.close()
  })
})
