// A shop that has never used Setline: the server starts on an empty database and prints a
// set-up code; the lead types it on /setup with the workshop's settings, lands signed in, and
// imports the mould list from a CSV (preview first, then import), then sees it on Moulds.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { openBrowser, screenshot } from '../setup/browser'
import { startEmptyServer } from '../setup/empty-server'
import { testDb } from '../setup/fixtures'

let browser: Awaited<ReturnType<typeof openBrowser>>
let empty: Awaited<ReturnType<typeof startEmptyServer>>

beforeAll(async () => {
  empty = await startEmptyServer()
  await empty.use()
  browser = await openBrowser()
}, 90_000)
afterAll(async () => {
  await browser?.close()
  await empty?.stop()
})

const MOULDS = [
  'code,casts,material,bench,cavity (L),cast length (m),prep (min),clean-out (min),maximum dwell (min),pulls,expected pulls,state,state reason',
  'GL-1,Ovolo cornice 120 mm,silicone,,3.8,1.2,10,10,120,0,150,ready,',
  'GL-2,Ceiling rose 600 mm,polyurethane,,6.5,,15,10,180,0,80,ready,',
  'GL-3,Corbel,plaster_piece,,2.1,,10,15,90,12,,ready,',
].join('\n')

describe('go live from nothing', () => {
  it('sets up the workshop with the console code, then imports the mould list', async () => {
    await expect.poll(() => empty.codes().length, { timeout: 20_000 }).toBeGreaterThan(0)
    const page = await browser.context.newPage()
    // signed out on an empty database: /setup is open to anyone who has the code
    await page.goto(`${empty.url}/setup`)
    await page.locator('html[data-hydrated]').waitFor()
    await page.getByRole('heading', { level: 1, name: 'Set up your workshop' }).waitFor()
    await page.getByLabel('Workshop name').fill('Wrenfield Plaster Studio')
    await page.getByLabel('Timezone').fill('Europe/Dublin')
    await page.getByLabel('Your name').fill('Orla Lead')
    await page.getByLabel('Your e-mail').fill('orla@wrenfield.example.test')
    await page.getByLabel('Password').fill('wrenfield-first-1')
    // a wrong code is refused in words, and nothing is created
    await page.getByLabel('Set-up code').fill('AAAA-AAAA-AAAA')
    await page.getByRole('button', { name: 'Set up the workshop' }).click()
    await page.getByTestId('setup-error').getByText(/Set-up code is wrong, used or expired/).waitFor()
    expect(await testDb()('workshops').count('* as n').first()).toEqual({ n: '0' })
    await page.getByLabel('Set-up code').fill(empty.codes().at(-1)!)
    await screenshot(page, 'go-live-setup')
    await page.getByRole('button', { name: 'Set up the workshop' }).click()
    await page.waitForURL(`${empty.url}/lead`)

    await page.getByRole('link', { name: 'Import' }).click()
    await page.getByRole('heading', { level: 1, name: 'Import from a spreadsheet' }).waitFor()
    expect(await page.getByTestId('import-template').getAttribute('href')).toBe('/api/import/moulds/template')
    await page.getByLabel('CSV file').setInputFiles({ name: 'moulds.csv', mimeType: 'text/csv', buffer: Buffer.from(MOULDS) })
    await page.getByRole('button', { name: 'Preview' }).click()
    await page.getByTestId('import-preview').getByText('3 rows read from moulds.csv; all ready to import.').waitFor()
    await page.getByTestId('import-row-3').getByText('Ceiling rose 600 mm').waitFor()
    expect(await testDb()('moulds').count('* as n').first()).toEqual({ n: '0' })
    await screenshot(page, 'go-live-import-preview')
    await page.getByTestId('import-confirm').click()
    await page.getByTestId('import-done').getByText('Imported 3 moulds').waitFor()

    await page.getByRole('link', { name: 'Moulds' }).click()
    await page.getByRole('heading', { level: 1, name: 'Moulds' }).waitFor()
    for (const code of ['GL-1', 'GL-2', 'GL-3']) await page.getByText(code, { exact: true }).first().waitFor()
    await screenshot(page, 'go-live-moulds')
    // the set-up page is gone now
    expect((await page.request.get(`${empty.url}/setup`)).status()).toBe(404)
  })
})
