// The lead's casting register and quality figures in the browser: a job with two pours cast
// through the floor API (one sound, one with air holes), filtered in the register, exported as
// CSV with the same filter, and counted on the quality page with its charts drawn.
import { randomUUID } from 'node:crypto'
import { readFileSync } from 'node:fs'
import { afterAll, beforeAll, describe, expect, it, inject } from 'vitest'
import { openBrowser, screenshot, signInThroughForm } from '../setup/browser'
import { DEMO_PASSWORD, closeTestDb, demo } from '../setup/fixtures'
import { boardFixture } from '../setup/board-fixtures'
import { call, signIn } from '../setup/http'

const base = inject('baseUrl')
let browser: Awaited<ReturnType<typeof openBrowser>>
let fx: Awaited<ReturnType<typeof boardFixture>>
beforeAll(async () => {
  browser = await openBrowser()
  fx = await boardFixture('register-e2e')
})
afterAll(async () => {
  await browser?.close()
  await closeTestDb()
})

const minutesAgo = (m: number) => new Date(Date.now() - m * 60_000).toISOString()

/** A pour planned two hours ago on a fresh mould, taken through mixing, pouring and demoulding (recorded late). */
async function castToday(lead: string, caster: string, itemId: number, result: { result: 'sound' } | { result: 'defect'; defect: string }) {
  const mouldId = await fx.mould()
  const slotStart = new Date(Math.floor((Date.now() - 120 * 60_000) / 60_000) * 60_000).toISOString()
  const p = await call('/api/pours', { method: 'POST', cookie: lead, body: { mouldId, slotStart, jobItemId: itemId, casterId: fx.casterId } })
  expect(p.status, JSON.stringify(p.data)).toBe(201)
  const steps = [
    { kind: 'start_mixing', version: 1, waterTempC: 18, at: minutesAgo(100) },
    { kind: 'poured', version: 2, plasterKg: 2.9, waterKg: 2.03, shopTempC: 17, at: minutesAgo(96) },
    { kind: 'demoulded', version: 3, ...result, at: minutesAgo(50) },
  ]
  for (const body of steps) {
    const r = await call(`/api/pours/${p.data.id}/actions`, { method: 'POST', cookie: caster, body: { actionId: randomUUID(), ...body } })
    expect(r.status, JSON.stringify(r.data)).toBe(200)
  }
  return { pourId: p.data.id as number, mouldCode: p.data.mouldCode as string }
}

describe('casting register and quality', () => {
  it('the lead filters a job\'s register, exports the filtered CSV and sees the pours on the quality page', async () => {
    const lead = await signIn(demo.lead.email, DEMO_PASSWORD)
    const caster = await signIn(demo.caster1.email, DEMO_PASSWORD)
    const jobId = await fx.job()
    const itemId = await fx.item(jobId, null)
    const sound = await castToday(lead, caster, itemId, { result: 'sound' })
    const holed = await castToday(lead, caster, itemId, { result: 'defect', defect: 'air holes' })

    const page = await browser.context.newPage()
    await signInThroughForm(page, base, demo.lead.email, DEMO_PASSWORD, '/lead')
    await page.goto(`${base}/lead/jobs/${jobId}`)
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
    await expect(table.textContent()).resolves.toContain('air holes')
    await screenshot(page, 'register-filtered')

    const [download] = await Promise.all([page.waitForEvent('download'), page.getByTestId('register-export').click()])
    const csv = readFileSync((await download.path())!, 'utf8').trim().split(/\r?\n/)
    expect(csv).toHaveLength(2) // the header and the one defect: the export keeps the filter
    expect(csv[1]).toContain(holed.mouldCode)
    expect(csv[1]).toContain('air holes')

    await page.goto(`${base}/lead/quality`)
    await page.getByRole('heading', { level: 1, name: 'Quality' }).waitFor()
    const byMould = page.locator('section', { has: page.getByRole('heading', { name: 'Defect rate by mould' }) })
    const rowOf = (code: string) => byMould.locator('tbody tr', { has: page.getByRole('rowheader', { name: code }) })
    await expect.poll(() => rowOf(holed.mouldCode).locator('td').allTextContents()).toEqual(['1', '1', '100 %'])
    await expect(rowOf(sound.mouldCode).locator('td').allTextContents()).resolves.toEqual(['1', '0', '0 %'])
    await byMould.locator('canvas').waitFor() // the chart is drawn beside its table
    await screenshot(page, 'quality-figures')
    await page.close()
  }, 120_000)
})
