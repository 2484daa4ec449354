// From enquiry to an accepted quote, in the browser: the lead sets the workshop's rates, prices
// a take-off (our own worked example's drawing room), sends it; the client accepts it on a phone.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { VIEWPORTS, openBrowser, screenshot, signInThroughForm, gotoHydrated } from '../setup/browser'
import { DEMO_PASSWORD, closeTestDb, demo } from '../setup/fixtures'
import { testContext } from '../setup/context'
import { seriousAxeViolations } from '../setup/axe'
import { fillDrawingRoomTakeOff, saveJourneyRates } from '../setup/quote-journey'

const base = testContext().baseUrl
let desk: Awaited<ReturnType<typeof openBrowser>>
let phone: Awaited<ReturnType<typeof openBrowser>>
beforeAll(async () => {
  desk = await openBrowser(VIEWPORTS.desktop)
  phone = await openBrowser(VIEWPORTS.phone)
})
afterAll(async () => {
  await desk?.close()
  await phone?.close()
  await closeTestDb()
})

describe('a quote from take-off to acceptance', () => {
  it('the lead prices and sends a take-off; the client accepts it on a phone', async () => {
    const lead = await desk.context.newPage()
    await signInThroughForm(lead, base, demo.lead.email, DEMO_PASSWORD)
    await lead.goto(`${base}/lead/quotes`)
    await lead.getByRole('heading', { level: 1, name: 'Quotes' }).waitFor()
    await lead.locator('html[data-hydrated]').waitFor()

    // rates: typed as money, kept in pence
    await saveJourneyRates(lead)
    // the take-off: one drawing room, walls 5.0 m and 3.1 m, 9 kg per length, a new mould
    await fillDrawingRoomTakeOff(lead, 'Drawing room cornice')
    expect(await seriousAxeViolations(lead)).toEqual([])
    await lead.getByRole('button', { name: 'Price this take-off' }).click()
    await lead.waitForURL(/\/lead\/quotes\/\d+$/)
    await lead.getByRole('heading', { level: 1, name: /Q-\d{4} · Drawing room cornice/ }).waitFor()
    // by hand (our own worked example; the form's defaults: 3 m lengths, 0.3 m shortest piece,
    // 25 kg bags, one delivery, fixing on): unit prices carry the 15 % margin, rounded to the penny.
    // New mould 483.00 + 3 lengths × 40.25 + fettling 3 × 10.35 + 2 bags × 21.28
    // + fixing 8.1 m × 14.38 (116.478 → 116.48) + one delivery 69.00 = 862.84 net;
    // tax 20 % = 172.568 → 172.57; total 1,035.41
    await lead.getByText('£862.84', { exact: true }).waitFor()
    await lead.getByText('£1,035.41', { exact: true }).waitFor()
    await lead.getByText(/Shop's own estimate/).waitFor()
    expect(await seriousAxeViolations(lead)).toEqual([])
    await screenshot(lead, 'quote-lead-draft')
    await lead.getByRole('button', { name: 'Send to client' }).click()
    await lead.getByRole('dialog').getByRole('button', { name: 'Send to client' }).click()
    await lead.getByText(/this revision is now frozen/).waitFor()
    const quoteUrl = lead.url()

    // the client, on a phone: the quote is listed, read, accepted
    const client = await phone.context.newPage()
    await signInThroughForm(client, base, demo.client1.email, DEMO_PASSWORD)
    await gotoHydrated(client, `${base}/client`)
    await client.getByRole('heading', { name: 'Quotes' }).waitFor()
    await client.getByRole('link', { name: /Drawing room cornice/ }).click()
    await client.getByRole('heading', { level: 1, name: /Drawing room cornice/ }).waitFor()
    await client.locator('html[data-hydrated]').waitFor()
    expect(await client.getByText(/estimate/i).count()).toBe(0)
    expect(await seriousAxeViolations(client)).toEqual([])
    await client.getByRole('button', { name: 'Accept for £1,035.41' }).click()
    await client.getByText(/the workshop has your acceptance/).waitFor()
    await screenshot(client, 'quote-client-accepted')

    await lead.goto(quoteUrl)
    await lead.getByText(/Accepted · revision 1/).waitFor()
  }, 120_000)
})
