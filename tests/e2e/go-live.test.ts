// A shop that has never used Setline: the server starts on an empty database and prints a
// set-up code; the lead types it on /setup with the workshop's settings, lands signed in, and
// imports the mould list from a CSV (preview first, then import), then sees it on Moulds; then
// imports its plaster grade and its open jobs with their items, and plans a first pour.
import type { Page } from 'playwright-core'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { openBrowser, screenshot, gotoHydrated } from '../setup/browser'
import { seriousAxeViolations } from '../setup/axe'
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

const GRADES = [
  'name,preset,bag (kg),consistency min,consistency max,consistency,demould (min),notes,archived',
  'Wrenfield casting,beta-casting,25,,,70,,,no',
].join('\n')

const JOBS = [
  'job,title,client,site,site note,due on,sample,job notes,item,mould,profile,quantity,walls (m),shortest piece (m),spares (%),grade,consistency',
  'WJ-1,Parlour cornice,,,Parlour,2027-06-30,no,,Cornice run,GL-1,,,4.2 3.6 4.2 3.6,,5,Wrenfield casting,',
  'WJ-1,,,,,,,,Ceiling rose,GL-2,,2,,,,Wrenfield casting,',
  'WJ-2,Hall corbels,,,Hall,2027-07-15,no,,Corbels,GL-3,,6,,,,Wrenfield casting,',
].join('\n')

/** Imports one CSV of `kind` on the import page: preview (nothing written), then import. */
async function importCsv(page: Page, kind: string, name: string, csv: string, rows: number, done: string) {
  await page.getByLabel('What the file holds').selectOption(kind)
  await page.getByLabel('CSV file').setInputFiles({ name, mimeType: 'text/csv', buffer: Buffer.from(csv) })
  await page.getByRole('button', { name: 'Preview' }).click()
  await page.getByTestId('import-preview').getByText(`${rows} rows read from ${name}; all ready to import.`).waitFor()
  await page.getByTestId('import-confirm').click()
  await page.getByTestId('import-done').getByText(done).waitFor()
}

describe('go live from nothing', () => {
  it('sets up the workshop with the console code, imports moulds, a grade and open jobs, plans a first pour, gives a job a new client and site', async () => {
    await expect.poll(() => empty.codes().length, { timeout: 20_000 }).toBeGreaterThan(0)
    const page = await browser.context.newPage()
    // signed out on an empty database: /setup is open to anyone who has the code
    await gotoHydrated(page, `${empty.url}/setup`)
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
    await page.getByTestId('import-done').getByText('Imported 3 rows: Moulds').waitFor()

    await page.getByRole('link', { name: 'Moulds' }).click()
    await page.getByRole('heading', { level: 1, name: 'Moulds' }).waitFor()
    for (const code of ['GL-1', 'GL-2', 'GL-3']) await page.getByText(code, { exact: true }).first().waitFor()
    await screenshot(page, 'go-live-moulds')
    // the set-up page is gone now
    expect((await page.request.get(`${empty.url}/setup`)).status()).toBe(404)

    // the plaster grade, then the open jobs with their items (after the moulds they name)
    await page.getByRole('link', { name: 'Import' }).click()
    await page.getByRole('heading', { level: 1, name: 'Import from a spreadsheet' }).waitFor()
    await importCsv(page, 'grades', 'grades.csv', GRADES, 1, 'Imported 1 row: Plaster grades')
    await importCsv(page, 'jobs', 'jobs.csv', JOBS, 3, 'Imported 3 rows: Open jobs with their items')
    expect(await testDb()('jobs').orderBy('code').pluck('code')).toEqual(['WJ-1', 'WJ-2'])
    const run = await testDb()('job_items').where({ description: 'Cornice run' }).first('pieces_needed', 'run_m')
    expect(Number(run.run_m)).toBeCloseTo(15.6, 6)
    expect(await seriousAxeViolations(page)).toEqual([])
    await screenshot(page, 'go-live-jobs-imported')

    // a first pour: the corbels on their mould, on the board
    await page.getByRole('link', { name: 'Pour board' }).click()
    await page.getByRole('heading', { level: 1, name: 'Pour board' }).waitFor()
    await page.locator('html[data-hydrated]').waitFor()
    await page.getByTestId('board-new-pour').click()
    const dialog = page.getByRole('dialog', { name: 'New pour' })
    const corbels = await dialog.getByLabel('Job item').locator('option', { hasText: 'WJ-2' }).getAttribute('value')
    await dialog.getByLabel('Job item').selectOption(corbels!)
    await dialog.getByLabel('Mould').selectOption({ label: 'GL-3 · Corbel' })
    await dialog.getByLabel('Date').fill('2027-06-01')
    await dialog.getByLabel('Prep starts at').fill('09:00')
    await dialog.getByRole('button', { name: 'Put on the board' }).click()
    await expect.poll(() => page.getByTestId('board-message').textContent({ timeout: 1000 }).catch(() => ''), { timeout: 15_000 }).toMatch(/Planned WJ-2 on GL-3/)
    const pour = await testDb()('pours as p').join('job_items as i', 'i.id', 'p.job_item_id').where('i.description', 'Corbels').first('p.state', 'p.grade_id')
    expect(pour.state).toBe('planned')
    expect(pour.grade_id).not.toBeNull()
    await screenshot(page, 'go-live-first-pour')

    // the job's client and site, both new, added from the job form
    const wj2 = await testDb()('jobs').where({ code: 'WJ-2' }).first('id')
    await gotoHydrated(page, `${empty.url}/lead/jobs/${wj2.id}`)
    await page.getByRole('button', { name: 'Edit job' }).click()
    await page.locator('#job-client').selectOption({ label: 'New client…' })
    const clientForm = page.getByRole('form', { name: 'Client' })
    await clientForm.getByLabel('Name', { exact: true }).fill('Harrow Lane Developments')
    await clientForm.getByRole('button', { name: 'Add client' }).click()
    await expect.poll(() => page.locator('#job-client').locator('option:checked').textContent()).toBe('Harrow Lane Developments')
    await page.locator('#job-site-id').selectOption({ label: 'New site…' })
    const siteForm = page.getByRole('form', { name: 'Site' })
    await siteForm.getByLabel('Name', { exact: true }).fill('Harrow Lane, plot 4')
    await siteForm.getByLabel('Address').fill('4 Harrow Lane, Example Town')
    await siteForm.getByLabel('Lifting').fill('Scaffold hoist to the first floor')
    await siteForm.getByRole('button', { name: 'Add site' }).click()
    await expect.poll(() => page.locator('#job-site-id').locator('option:checked').textContent()).toBe('Harrow Lane, plot 4')
    await page.getByRole('button', { name: 'Save job' }).click()
    await expect.poll(async () => (await testDb()('jobs').where({ code: 'WJ-2' }).first('site_id')).site_id, { timeout: 15_000 }).not.toBeNull()
    await page.getByRole('link', { name: 'Clients' }).click()
    await page.getByRole('link', { name: 'Harrow Lane Developments' }).click()
    await page.getByRole('heading', { level: 1, name: 'Harrow Lane Developments' }).waitFor()
    await page.getByText('Scaffold hoist to the first floor').waitFor()
    await page.getByRole('link', { name: 'WJ-2 Hall corbels' }).waitFor()
    expect(await seriousAxeViolations(page)).toEqual([])
    await screenshot(page, 'go-live-client')
  }, 240_000)
})
