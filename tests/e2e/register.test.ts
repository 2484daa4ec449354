// The lead's casting register and quality figures in the browser: a job with two pours cast
// through the floor API (one sound, one cracked), filtered in the register, exported as
// CSV with the same filter, and counted on the quality page with its charts drawn.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { downloadText, openBrowser, screenshot, signInThroughForm, gotoHydrated } from '../setup/browser'
import { DEMO_PASSWORD, closeTestDb, demo } from '../setup/fixtures'
import { finishingFixture } from '../setup/finishing-fixtures'
import { testContext } from '../setup/context'

const base = testContext().baseUrl
let browser: Awaited<ReturnType<typeof openBrowser>>
let fx: Awaited<ReturnType<typeof finishingFixture>>
beforeAll(async () => {
  browser = await openBrowser()
  fx = await finishingFixture('register-e2e')
})
afterAll(async () => {
  await browser?.close()
  await closeTestDb()
})

/** A piece cast through the floor API (recorded late, a few hours back), with its mould's code. */
async function cast(itemId: number, result: 'sound' | 'defect') {
  const p = await fx.piece({ itemId, result })
  const mould = await fx.k('moulds').where({ id: p.mouldId }).first('code')
  return { ...p, mouldCode: mould.code as string }
}

describe('casting register and quality', () => {
  it('the lead filters a job\'s register, exports the filtered CSV and sees the pours on the quality page', async () => {
    const jobId = await fx.job()
    const itemId = await fx.item(jobId, null)
    const sound = await cast(itemId, 'sound')
    const cracked = await cast(itemId, 'defect')

    const page = await browser.context.newPage()
    await signInThroughForm(page, base, demo.lead.email, DEMO_PASSWORD, '/lead')
    await gotoHydrated(page, `${base}/lead/jobs/${jobId}`)
    await page.getByRole('link', { name: 'Casting register' }).click()
    await page.getByRole('heading', { level: 1, name: /Casting register/ }).waitFor()
    const table = page.getByRole('table', { name: 'Casting register' })
    await expect.poll(() => table.locator('tbody tr').count()).toBe(2)
    await expect(table.textContent()).resolves.toContain(sound.mouldCode)
    await expect(table.textContent()).resolves.toMatch(/back-dated/)
    await screenshot(page, 'register-job')

    await page.getByLabel('Result').selectOption('defect')
    await page.getByRole('button', { name: 'Apply filters' }).click()
    await expect.poll(() => table.locator('tbody tr').count()).toBe(1)
    await expect(table.textContent()).resolves.toContain('crack')
    await screenshot(page, 'register-filtered')

    const [download] = await Promise.all([page.waitForEvent('download'), page.getByTestId('register-export').click()])
    const csv = (await downloadText(download)).trim().split(/\r?\n/)
    expect(csv).toHaveLength(2) // the header and the one defect: the export keeps the filter
    expect(csv[1]).toContain(cracked.mouldCode)
    expect(csv[1]).toContain('crack')

    await page.goto(`${base}/lead/quality`)
    await page.getByRole('heading', { level: 1, name: 'Quality' }).waitFor()
    const byMould = page.locator('section', { has: page.getByRole('heading', { name: 'Defect rate by mould' }) })
    const rowOf = (code: string) => byMould.locator('tbody tr', { has: page.getByRole('rowheader', { name: code }) })
    await expect.poll(() => rowOf(cracked.mouldCode).locator('td').allTextContents()).toEqual(['1', '1', '100 %'])
    await expect(rowOf(sound.mouldCode).locator('td').allTextContents()).resolves.toEqual(['1', '0', '0 %'])
    await byMould.locator('canvas').waitFor() // the chart is drawn beside its table
    await screenshot(page, 'quality-figures')
    await page.close()
  }, 120_000)
})
