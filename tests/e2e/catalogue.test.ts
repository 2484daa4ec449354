// Browser journeys for the catalogue and jobs: a lead sets up a mould and a job with a run
// item from walls; a client approves a sample; the catalogue pages show their warnings.
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest'
import type { Page } from 'playwright-core'
import { openBrowser, screenshot, signInThroughForm, VIEWPORTS, gotoHydrated } from '../setup/browser'
import { DEMO_PASSWORD, closeTestDb, demo, demoWorkshopId, testDb } from '../setup/fixtures'
import { testContext } from '../setup/context'

const base = testContext().baseUrl
let browser: Awaited<ReturnType<typeof openBrowser>>
const uid = Math.random().toString(36).slice(2, 6).toUpperCase()

beforeAll(async () => {
  browser = await openBrowser()
})
afterAll(async () => {
  await browser?.close()
  await closeTestDb()
})
beforeEach(async () => {
  await browser.context.clearCookies()
})

const signIn = (page: Page, email: string, home: string) => signInThroughForm(page, base, email, DEMO_PASSWORD, home)

describe('lead sets up a mould and a job', () => {
  it('creates a run mould, then a job with a run item from walls', async () => {
    const page = await browser.context.newPage()
    await signIn(page, demo.lead.email, '/lead')
    await page.getByRole('link', { name: 'Moulds' }).click()
    await page.getByRole('heading', { level: 1, name: 'Moulds' }).waitFor()
    await page.getByRole('button', { name: 'New mould' }).click()
    // the browser checks the form with the shared schema before sending anything
    await page.getByRole('button', { name: 'Add mould' }).click()
    await page.getByText('code is required').waitFor()
    const code = `E2E-${uid}`
    await page.getByLabel('Code', { exact: true }).fill(code)
    await page.getByLabel('What it casts').fill('Bead cornice, 1.5 m length')
    await page.getByLabel('Cavity (L)').fill('5.5')
    await page.getByLabel('Cast length (m)').fill('1.5')
    await page.getByLabel('Expected life (casts)').fill('120')
    await screenshot(page, 'catalogue-mould-form')
    await page.getByRole('button', { name: 'Add mould' }).click()
    await page.getByRole('heading', { level: 1, name: new RegExp(code) }).waitFor()
    await page.getByLabel('New state').selectOption('repair')
    await page.getByLabel('Reason').fill('Flange torn at the return')
    await page.getByRole('button', { name: 'Change state' }).click()
    await page.getByText(/moved it from ready to repair: “Flange torn at the return”/).waitFor()
    await screenshot(page, 'catalogue-mould-detail')

    await page.getByRole('link', { name: 'Jobs' }).click()
    await page.getByRole('heading', { level: 1, name: 'Jobs' }).waitFor()
    await page.getByRole('button', { name: 'New job' }).click()
    await page.getByLabel('Job code').fill(`J-${uid}`)
    await page.getByLabel('Title').fill('Library cornice')
    await page.getByLabel('Site note').fill('Orchard Road library (invented)')
    await page.getByRole('button', { name: 'Add job' }).click()
    await page.getByRole('heading', { level: 1, name: new RegExp(`J-${uid}`) }).waitFor()

    await page.getByRole('button', { name: 'Add an item' }).click()
    await page.getByLabel('A run in metres, from walls').check()
    await page.getByRole('form', { name: 'Job item' }).getByLabel('Description').fill('Library cornice run')
    await page.getByLabel('Mould', { exact: true }).selectOption({ label: `${code} · Bead cornice, 1.5 m length` })
    await page.getByLabel('Plaster grade').selectOption({ label: 'Fine casting (beta)' })
    await page.getByLabel('Wall 1 (m)').fill('6.2')
    await page.getByRole('button', { name: 'Add a wall' }).click()
    await page.getByLabel('Wall 2 (m)').fill('4.4')
    const preview = page.getByTestId('run-preview')
    await preview.getByText(/cast lengths/).waitFor()
    // 6.2 m → 1.5 ×3 + 0.85 + 0.85 (a 0.2 m end is under the 0.3 m shortest piece); 4.4 m → 1.5 ×2 + 1.4;
    // first-fit packs them into 8 lengths; 10 % spares → 1
    await expect(preview.textContent()).resolves.toMatch(/9 cast lengths \(8 used \+ 1 spare\)/)
    await expect(preview.textContent()).resolves.toMatch(/Plaster for the run: [\d.]+ kg ≈ \d+ × 25 kg/)
    await screenshot(page, 'catalogue-run-calculator')
    await page.getByRole('button', { name: 'Add item' }).click()
    await page.getByRole('status').getByText('Item added.').waitFor()
    const row = page.getByRole('row', { name: /Library cornice run/ })
    await expect(row.textContent()).resolves.toMatch(/10\.60? m run, 2 walls, 10 % spares/)
    await screenshot(page, 'catalogue-job-detail')
    await page.close()
  })

  it('shows the catalogue pages with their warnings', async () => {
    const page = await browser.context.newPage()
    await signIn(page, demo.lead.email, '/lead')
    await page.goto(`${base}/lead/lots`)
    await page.getByRole('heading', { level: 1, name: 'Plaster lots' }).waitFor()
    await page.getByText(/Past its use-by date/).first().waitFor()
    await screenshot(page, 'catalogue-lots')
    await gotoHydrated(page, `${base}/lead/plasters`)
    await page.getByRole('heading', { level: 1, name: 'Plasters' }).waitFor()
    await page.getByRole('button', { name: 'New grade from a preset' }).click()
    await page.getByLabel('Powder density (g/cm³)').waitFor()
    await screenshot(page, 'catalogue-plasters')
    await gotoHydrated(page, `${base}/lead/moulds`)
    await page.getByRole('heading', { level: 1, name: 'Moulds' }).waitFor()
    await page.getByLabel('Search').fill('CR-10')
    await page.getByText('2 of').waitFor()
    await expect(page.getByRole('row', { name: /CR-102/ }).textContent()).resolves.toMatch(/near end of life/)
    await screenshot(page, 'catalogue-moulds')
    await page.close()
  })
})

describe('client approves a sample', () => {
  it('a client member approves the sample with a comment; the job is released', async () => {
    const ws = await demoWorkshopId()
    const k = testDb()
    const [job] = await k('jobs').insert({ workshop_id: ws, code: `S-${uid}`, title: 'Panel mouldings', site: 'Garden room (invented)', sample_required: true, sample_state: 'awaiting_approval', notes: 'INTERNAL-NOTE' }).returning('id')
    const client = await k('users').where({ email: demo.client1.email }).first('id')
    await k('job_members').insert({ workshop_id: ws, job_id: job.id, user_id: client.id })
    await k('job_items').insert({ workshop_id: ws, job_id: job.id, description: 'Bead-and-reel panel moulding', quantity: 12, pieces_needed: 12 })

    const page = await browser.context.newPage()
    await page.setViewportSize(VIEWPORTS.phone)
    await signIn(page, demo.client1.email, '/client')
    await page.getByRole('link', { name: new RegExp(`S-${uid}`) }).click()
    await page.getByRole('heading', { level: 1, name: new RegExp(`S-${uid}`) }).waitFor()
    expect(await page.content()).not.toContain('INTERNAL-NOTE')
    await page.getByLabel('Ask for changes').check()
    await page.getByRole('button', { name: 'Send my comments' }).click()
    await page.getByText('comment is required when you ask for changes').waitFor()
    await page.getByLabel('Approve the sample: go ahead with the run').check()
    await page.getByLabel('Comment').fill('Crisp beads; go ahead.')
    await screenshot(page, 'client-sample-decision')
    await page.getByRole('button', { name: 'Approve sample' }).click()
    await page.getByText(/the sample is approved/).waitFor()
    await screenshot(page, 'client-sample-approved')
    const row = await k('jobs').where({ id: job.id }).first('sample_state', 'sample_comment', 'sample_decided_by')
    expect(row).toMatchObject({ sample_state: 'approved', sample_comment: 'Crisp beads; go ahead.' })
    expect(Number(row.sample_decided_by)).toBe(Number(client.id))
    await page.close()
  })
})
