// Browser journey on the finisher's tablet (820×1180): a finisher fettles a piece (dry-by from
// the drying room, and which falling-rate factor it used); a piece put to dry yesterday and
// weighed then is weighed again, shows constant weight, is marked ready and, with the Wi-Fi
// down, packed (the outbox
// sends it when the connection returns); the lead makes a dispatch note for the job and reads
// it, and the packed piece leaves the finisher's list live. Screenshots at each step.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Page } from 'playwright-core'
import { VIEWPORTS, openBrowser, screenshot, signInThroughForm } from '../setup/browser'
import { randomUUID } from 'node:crypto'
import { DEMO_PASSWORD, closeTestDb, demo } from '../setup/fixtures'
import { call, signIn } from '../setup/http'
import { finishingFixture } from '../setup/finishing-fixtures'
import { testContext } from '../setup/context'

const base = testContext().baseUrl
let browser: Awaited<ReturnType<typeof openBrowser>>
let fx: Awaited<ReturnType<typeof finishingFixture>>
beforeAll(async () => {
  browser = await openBrowser(VIEWPORTS.tablet, { serviceWorkers: 'allow' })
  fx = await finishingFixture('finish-e2e')
})
afterAll(async () => {
  await browser?.close()
  await closeTestDb()
})

const card = (page: Page, id: number) => page.locator(`[data-testid="piece-card"][data-piece-id="${id}"]`)
const stateOf = (page: Page, id: number) => card(page, id).getAttribute('data-state', { timeout: 2000 }).catch(() => null)
/** Opens a tab and waits for the card to show there, sent (no "sending…"). */
async function onTab(page: Page, tab: string, id: number, state: string) {
  await page.getByTestId(`tab-${tab}`).click()
  await expect.poll(() => stateOf(page, id), { timeout: 15_000 }).toBe(state)
  await expect.poll(() => card(page, id).getByTestId('piece-state').textContent(), { timeout: 15_000 }).not.toMatch(/sending/)
}

describe('finishing', () => {
  it('a finisher fettles, weighs, readies and packs a piece; the lead makes its dispatch note', async () => {
    const job = await fx.job({ due_on: '2031-02-03', site: 'Larkspur Hall, library' })
    const jobCode = (await fx.k('jobs').where({ id: job }).first('code')).code as string
    // p went to dry yesterday and was weighed then (through the API, dated back): today's
    // weighing can show constant weight; q is fettled on the tablet
    const p = await fx.piece({ itemId: await fx.item(job, null, { pieces_needed: 1, description: 'Library frieze' }), hoursBack: 30 })
    const q = await fx.piece()
    const finisherApi = await signIn(demo.finisher.email, DEMO_PASSWORD)
    const ago = (h: number) => new Date(Date.now() - h * 3_600_000).toISOString()
    const kg = Number((p.dryMassKg * 1.001).toFixed(2))
    for (const body of [{ kind: 'fettled', version: 1, at: ago(29) }, { kind: 'weighed', version: 2, weighedKg: kg, at: ago(25) }]) {
      const r = await call(`/api/pieces/${p.id}/actions`, { method: 'POST', cookie: finisherApi, body: { actionId: randomUUID(), ...body } })
      expect(r.status, JSON.stringify(r.data)).toBe(200)
    }

    const page = await browser.context.newPage()
    await signInThroughForm(page, base, demo.finisher.email, DEMO_PASSWORD, '/finishing')
    await page.getByRole('heading', { level: 1, name: 'Finishing' }).waitFor()
    await card(page, q.id).waitFor()
    await card(page, q.id).scrollIntoViewIfNeeded()
    await screenshot(page, 'finishing-queue')

    // fettled: the drying room's conditions give the dry-by before the tap, and say which falling-rate factor
    await card(page, q.id).getByTestId('piece-next').click()
    await card(page, q.id).getByLabel('Room °C').fill('30')
    await card(page, q.id).getByLabel('Humidity %').fill('40')
    await expect.poll(() => card(page, q.id).getByTestId('dry-by-preview').textContent()).toMatch(/Dry by about .* h\), then weigh it twice, a day apart/)
    await expect(card(page, q.id).getByTestId('falling-rate-note').textContent()).resolves.toMatch(/no allowance yet .* pieces weighed to constant weight|from \d+ of the shop's pieces/)
    await screenshot(page, 'finishing-fettle-form')
    await card(page, q.id).getByTestId('finishing-submit').click()
    await onTab(page, 'drying', q.id, 'drying')
    await expect(card(page, q.id).getByTestId('piece-dry-by').textContent()).resolves.toMatch(/Dry by\s*\w{3} \d+ \w{3} \d{4} \d\d:\d\d/)

    // p: yesterday's weighing alone is not proof; today's, the same weight a day later, is
    await card(page, p.id).scrollIntoViewIfNeeded()
    await expect(card(page, p.id).getByTestId('piece-weighing').getAttribute('data-dry')).resolves.toBe('false')
    await expect(card(page, p.id).getByTestId('piece-weighing').textContent()).resolves.toMatch(/second weighing at least 24 hours/)
    await card(page, p.id).getByTestId('piece-next').click()
    await card(page, p.id).getByLabel('Weighed kg').fill(kg.toFixed(2))
    await expect.poll(() => card(page, p.id).getByTestId('weigh-preview').getAttribute('data-dry')).toBe('true')
    await expect(card(page, p.id).getByTestId('weigh-preview').textContent()).resolves.toMatch(/Constant weight: 0\.00 % change over 25 h/)
    await screenshot(page, 'finishing-weigh-form')
    await card(page, p.id).getByTestId('finishing-submit').click()
    await expect.poll(() => card(page, p.id).getByTestId('piece-weighing').getAttribute('data-dry', { timeout: 2000 }).catch(() => null), { timeout: 15_000 }).toBe('true')
    await expect(page.getByTestId('finishing-answer').textContent()).resolves.toMatch(/constant weight, dry: it can be marked ready/)
    await screenshot(page, 'finishing-weighed')

    // ready
    await expect(card(page, p.id).getByTestId('piece-next').textContent()).resolves.toMatch(/Ready/)
    await card(page, p.id).getByTestId('piece-next').click()
    await card(page, p.id).getByTestId('finishing-submit').click()
    await onTab(page, 'ready', p.id, 'ready')
    await screenshot(page, 'finishing-ready')

    // packed with the Wi-Fi down: it waits in the outbox, then lands once
    await browser.context.setOffline(true)
    await card(page, p.id).getByTestId('piece-next').click()
    await card(page, p.id).getByTestId('finishing-submit').click()
    await expect.poll(() => page.getByTestId('outbox-pending').textContent()).toMatch(/1 waiting/)
    await page.getByTestId('tab-packed').click()
    await expect.poll(() => stateOf(page, p.id)).toBe('packed')
    await screenshot(page, 'finishing-packed-offline')
    await browser.context.setOffline(false)
    await expect.poll(() => page.getByTestId('outbox-pending').textContent(), { timeout: 30_000 }).toMatch(/All actions sent/)
    expect(await fx.k('pieces').where({ id: p.id }).first('state', 'version')).toEqual({ state: 'packed', version: 6 })
    expect(await fx.k('events').where({ entity: 'piece', entity_id: String(p.id) }).orderBy('id').pluck('type'))
      .toEqual(['piece.created', 'piece.fettled', 'piece.weighed', 'piece.weighed', 'piece.ready', 'piece.packed'])

    // the lead's dispatch view on the job page: make the note and read it
    const leadCtx = await openBrowser(VIEWPORTS.desktop)
    try {
      const lead = await leadCtx.context.newPage()
      await signInThroughForm(lead, base, demo.lead.email, DEMO_PASSWORD, '/lead')
      await lead.goto(`${base}/lead/jobs/${job}`)
      const panel = lead.getByTestId('dispatch-panel')
      await panel.getByText(p.mark).waitFor()
      await expect(panel.getByRole('checkbox').isChecked()).resolves.toBe(true)
      await panel.scrollIntoViewIfNeeded()
      await screenshot(lead, 'finishing-lead-dispatch-panel')
      await panel.getByTestId('dispatch-make').click()
      await lead.waitForURL(/\/dispatches\/\d+$/)
      const note = lead.getByTestId('dispatch-note')
      await note.waitFor()
      await expect(note.getByTestId('note-no').textContent()).resolves.toMatch(/^DN-\d{4}-\d{4}$/)
      await expect(note.locator(`tr[data-mark="${p.mark}"]`).textContent()).resolves.toContain('Library frieze')
      const weighed = Number((await fx.k('piece_weighings').where({ piece_id: p.id }).first('weighed_kg')).weighed_kg)
      await expect(note.getByTestId('note-total').textContent()).resolves.toBe(weighed.toFixed(2))
      await expect(note.getByTestId('note-caution').textContent()).resolves.toMatch(/two-person lift.*competent fixers/s)
      await expect(note.textContent()).resolves.toContain(jobCode)
      await screenshot(lead, 'finishing-dispatch-note')
      // the finisher's packed list follows live
      await expect.poll(() => card(page, p.id).count(), { timeout: 15_000 }).toBe(0)
      expect((await fx.k('pieces').where({ id: p.id }).first('state')).state).toBe('dispatched')
      await lead.goto(`${base}/lead/jobs/${job}`)
      await lead.getByTestId('dispatch-link').first().waitFor()
    }
    finally {
      await leadCtx.close()
    }
    await page.close()
  }, 180_000)
})
