// Browser journey of a client on their job: no completion date while pieces are not planned
// (the page says how many, in plain words), then, with every piece planned, the day the last
// piece is expected ready to dispatch (demould + fettling + the drying estimate), not the
// last demould. The job card on the list is tappable as a whole.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { VIEWPORTS, openBrowser, screenshot, signInThroughForm } from '../setup/browser'
import { DEMO_PASSWORD, closeTestDb, demo } from '../setup/fixtures'
import { boardFixture } from '../setup/board-fixtures'
import { testContext } from '../setup/context'
import { call, saveWorkshopSettings, signIn } from '../setup/http'
import { seriousAxeViolations } from '../setup/axe'
import { formatDay } from '#shared/utils/workshop-format'

const base = testContext().baseUrl
let browser: Awaited<ReturnType<typeof openBrowser>>
let fx: Awaited<ReturnType<typeof boardFixture>>
beforeAll(async () => {
  browser = await openBrowser(VIEWPORTS.phone)
  fx = await boardFixture('client-e2e')
})
afterAll(async () => {
  await browser?.close()
  await closeTestDb()
})

describe('client completion', () => {
  it('words while partly planned, the ready-to-dispatch day once all is planned', async () => {
    const lead = await signIn(demo.lead.email, DEMO_PASSWORD)
    const jobId = await fx.job({ title: 'Library cornice', due_on: '2029-04-20' })
    const client = await fx.k('users').where({ email: demo.client1.email }).first('id')
    await fx.k('job_members').insert({ workshop_id: fx.workshopId, job_id: jobId, user_id: client.id })
    const mouldId = await fx.mould()
    const itemId = await fx.item(jobId, mouldId, { pieces_needed: 2 })
    const plan = async (slotStart: string) => {
      const r = await call('/api/pours', { method: 'POST', cookie: lead, body: { mouldId, slotStart, jobItemId: itemId } })
      expect(r.status, JSON.stringify(r.data)).toBe(201)
      return r.data as { demouldOpenAt: string }
    }
    await plan('2029-03-05T09:00:00Z')

    const page = await browser.context.newPage()
    await signInThroughForm(page, base, demo.client1.email, DEMO_PASSWORD)
    await page.goto(`${base}/client`)
    const jobCard = page.locator('[data-testid="client-job"]', { hasText: 'Library cornice' })
    await jobCard.waitFor()
    // tapping the card away from its title opens the job
    const box = (await jobCard.boundingBox())!
    await page.mouse.click(box.x + box.width - 12, box.y + box.height - 12)
    await page.waitForURL(`${base}/client/jobs/${jobId}`)
    const expected = page.getByTestId('expected')
    await expect.poll(() => expected.textContent()).toBe('not planned yet: 1 of the 2 pieces is not scheduled for casting yet')
    expect(await page.locator('[data-stage]').first().locator('xpath=../dt').textContent()).toBe('Scheduled')
    expect(await page.content()).not.toContain('Fettled')
    await screenshot(page, 'client-partly-planned')
    expect(await seriousAxeViolations(page)).toEqual([])

    const last = await plan('2029-03-06T09:00:00Z')
    await page.reload()
    const progress = (await call(`/api/client/jobs/${jobId}/progress`, { cookie: await signIn(demo.client1.email, DEMO_PASSWORD) })).data
    expect(progress.completion.kind).toBe('ready_by')
    const readyBy = new Date(progress.completion.readyBy)
    // drying days after the last demould, never the demould itself
    expect(readyBy.getTime() - Date.parse(last.demouldOpenAt)).toBeGreaterThan(24 * 3_600_000)
    const day = formatDay(readyBy, progress.completion.timezone)
    await expect.poll(() => expected.textContent()).toBe(day)
    expect(await page.getByText('Ready to dispatch by:').count()).toBe(1)
    // the due day in the house day style too, never the stored 2029-04-20
    expect(await page.locator('main').textContent()).toContain(`Due: ${formatDay('2029-04-20', progress.completion.timezone)}`)
    expect(await page.locator('main').textContent()).not.toContain('2029-04-20')
    await screenshot(page, 'client-fully-planned')
    expect(await seriousAxeViolations(page)).toEqual([])
    // a workshop in the US style writes the day the US way (set as a lead sets it: the change
    // also drops the answers the server keeps for a moment, server/utils/read-cache.ts)
    const locale = (value: string) => saveWorkshopSettings(lead, { locale: value })
    await locale('en-US')
    await page.reload()
    const usDay = formatDay(readyBy, progress.completion.timezone, 'en-US')
    expect(usDay).not.toBe(day)
    await expect.poll(() => expected.textContent(), { timeout: 10_000 }).toBe(usDay)
    await locale('en-GB')
    await page.goto(`${base}/client`)
    await jobCard.waitFor()
    expect(await seriousAxeViolations(page)).toEqual([])
    await page.close()
  }, 180_000)

  it('a lead on a phone opens the menu that replaces the hidden sidebar, and Escape closes it', async () => {
    const page = await browser.context.newPage()
    await page.context().clearCookies()
    await signInThroughForm(page, base, demo.lead.email, DEMO_PASSWORD, '/lead')
    await page.locator('html[data-hydrated]').waitFor()
    const menu = page.getByTestId('nav-menu')
    await menu.waitFor({ state: 'visible' })
    expect((await menu.boundingBox())!.height).toBeGreaterThanOrEqual(48)
    await menu.click()
    const nav = page.locator('#phone-nav')
    await expect.poll(() => nav.isVisible()).toBe(true)
    await expect(menu.getAttribute('aria-expanded')).resolves.toBe('true')
    // the shell only: the Today page below is another screen's
    expect(await seriousAxeViolations(page, 'header')).toEqual([])
    await screenshot(page, 'lead-phone-menu')
    await page.keyboard.press('Escape')
    await expect.poll(() => nav.isVisible()).toBe(false)
    await expect.poll(() => page.evaluate(() => document.activeElement?.getAttribute('data-testid'))).toBe('nav-menu')
    await menu.click()
    await nav.getByRole('link', { name: 'Moulds' }).click()
    await page.waitForURL(`${base}/lead/moulds`)
    await expect.poll(() => nav.isVisible()).toBe(false)
    await page.close()
  }, 120_000)
})
