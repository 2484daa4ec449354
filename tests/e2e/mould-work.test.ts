// Browser journey: a lead records a new mould being made on the mould's page; the planner
// places the job's casts only from the mould's available-from day, and the client sees the
// day the last piece is ready to dispatch, the same day the planner projects.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { VIEWPORTS, openBrowser, screenshot, signInThroughForm, gotoHydrated } from '../setup/browser'
import { DEMO_PASSWORD, closeTestDb, demo } from '../setup/fixtures'
import { boardFixture } from '../setup/board-fixtures'
import { testContext } from '../setup/context'
import { call, signIn } from '../setup/http'
import { seriousAxeViolations } from '../setup/axe'
import { formatDay } from '#shared/utils/workshop-format'

const base = testContext().baseUrl
let browser: Awaited<ReturnType<typeof openBrowser>>
let fx: Awaited<ReturnType<typeof boardFixture>>
beforeAll(async () => {
  browser = await openBrowser(VIEWPORTS.desktop)
  fx = await boardFixture('work-e2e')
})
afterAll(async () => {
  await browser?.close()
  await closeTestDb()
})

type Pour = { jobItemId: number; mouldId: number; slotStart: string; casterId: number | null; day: string }

describe('mould work', () => {
  it('a job waiting for its new mould is planned after the available-from day, and the client sees the honest date', async () => {
    const lead = await signIn(demo.lead.email, DEMO_PASSWORD)
    const jobId = await fx.job({ title: 'Chapel cornice', due_on: '2029-06-29' })
    const client = await fx.k('users').where({ email: demo.client1.email }).first('id')
    await fx.k('job_members').insert({ workshop_id: fx.workshopId, job_id: jobId, user_id: client.id })
    const mouldId = await fx.mould()
    const itemId = await fx.item(jobId, mouldId, { pieces_needed: 2 })

    const page = await browser.context.newPage()
    await signInThroughForm(page, base, demo.lead.email, DEMO_PASSWORD, '/lead')
    await gotoHydrated(page, `${base}/lead/moulds/${mouldId}`)
    await page.getByLabel('Started on').fill('2029-04-02')
    await page.getByLabel('Available from').fill('2029-04-11')
    await page.getByRole('button', { name: 'Save mould work' }).click()
    await page.getByText('Mould work saved.').waitFor()
    await expect.poll(() => page.getByRole('note').filter({ hasText: 'Being made' }).count()).toBe(1)
    await screenshot(page, 'mould-work-new')
    expect(await seriousAxeViolations(page)).toEqual([])

    const range = { from: '2029-04-09', to: '2029-04-20' }
    // the lead's preview on the board says which mould the job waits for and when its last
    // piece is ready to dispatch, days in the workshop's style (other jobs of the shared demo
    // workshop are in the preview too: only this job's line is read, and nothing is accepted here)
    const { code: jobCode } = await fx.k('jobs').where({ id: jobId }).first('code')
    const { code: mouldCode } = await fx.k('moulds').where({ id: mouldId }).first('code')
    await gotoHydrated(page, `${base}/lead/board?view=week`)
    await page.locator('#plan-from').fill(range.from)
    await page.locator('#plan-to').fill(range.to)
    await page.getByRole('button', { name: 'Preview plan' }).click()
    const line = page.locator('li', { has: page.locator('strong', { hasText: jobCode }) })
    await line.getByTestId('plan-waits-for').waitFor({ timeout: 30_000 })
    // (the client-completion journey switches the demo workshop to en-US for a moment: either style)
    const styles = (['en-GB', 'en-US'] as const).map(l => `Waits for mould ${mouldCode}, available from ${formatDay('2029-04-11', 'UTC', l)}.`)
    expect(styles).toContain(await line.getByTestId('plan-waits-for').textContent())
    await expect(line.getByTestId('plan-ready-at').textContent()).resolves.toMatch(/^Last piece ready to dispatch about \w{3},? [\w ]+,? 2029 \d{2}:\d{2}\.$/)
    await screenshot(page, 'mould-work-plan-preview')
    const preview = await call('/api/planner/preview', { method: 'POST', cookie: lead, body: range })
    const mine: Pour[] = preview.data.pours.filter((p: Pour) => p.jobItemId === itemId)
    expect(mine).toHaveLength(2)
    for (const p of mine) expect(p.day >= '2029-04-11').toBe(true)
    const projected = preview.data.jobs.find((j: { jobId: number }) => j.jobId === jobId)
    expect(projected.waitsFor).toEqual({ mouldCode, availableOn: '2029-04-11' })
    const accepted = await call('/api/planner/accept', { method: 'POST', cookie: lead, body: { ...range, pours: mine.map(p => ({ jobItemId: p.jobItemId, mouldId: p.mouldId, slotStart: p.slotStart, casterId: p.casterId })) } })
    expect(accepted.status, JSON.stringify(accepted.data)).toBe(201)

    await page.context().clearCookies()
    await signInThroughForm(page, base, demo.client1.email, DEMO_PASSWORD)
    await page.goto(`${base}/client/jobs/${jobId}`)
    const progress = (await call(`/api/client/jobs/${jobId}/progress`, { cookie: await signIn(demo.client1.email, DEMO_PASSWORD) })).data
    expect(progress.completion.kind).toBe('ready_by')
    const tz = progress.completion.timezone
    // the client's day is the planner's projected day: one rule for both
    expect(formatDay(new Date(progress.completion.readyBy), tz)).toBe(formatDay(new Date(`${projected.projectedDate}T12:00:00Z`), 'UTC'))
    await expect.poll(() => page.getByTestId('expected').textContent()).toBe(formatDay(new Date(progress.completion.readyBy), tz))
    await screenshot(page, 'mould-work-client-date')
    expect(await seriousAxeViolations(page)).toEqual([])
    await page.close()
  }, 120_000)
})
