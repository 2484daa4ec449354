// Two casters on one shared tablet (820×1180): each step waiting in the outbox goes out only
// under the session of the person who took it. Ada takes two steps with the Wi-Fi down and
// hands the tablet to Tamsin; Tamsin's step goes out when the connection returns while Ada's wait,
// shown as hers, until she switches in again. Then a session ended under the tablet (a lead
// disables Ada) stops the outbox at one 401 and asks for a sign-in; the step stays pending and
// lands under Ada's name once she is back. A step from before owners were recorded waits for
// a lead. The register's events (who did each step) are read from the database.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Page, Request } from 'playwright-core'
import { VIEWPORTS, openBrowser, screenshot, signInThroughForm, gotoHydrated } from '../setup/browser'
import { call, signIn } from '../setup/http'
import { DEMO_PASSWORD, closeTestDb, demo, makeUser, setPinDirect } from '../setup/fixtures'
import { boardFixture } from '../setup/board-fixtures'
import { testContext } from '../setup/context'

const base = testContext().baseUrl
const ACTIONS = /^\/api\/pours\/\d+\/actions$/
const isAction = (u: URL) => ACTIONS.test(u.pathname)
let browser: Awaited<ReturnType<typeof openBrowser>>
let fx: Awaited<ReturnType<typeof boardFixture>>
let lead: string
const ada = { id: 0, name: 'Ada Marle', pin: '3958' }
const tamsin = { id: 0, name: 'Tamsin Rowe', pin: '8163' }

beforeAll(async () => {
  browser = await openBrowser(VIEWPORTS.tablet, { serviceWorkers: 'allow' })
  fx = await boardFixture('outbox-owner')
  lead = await signIn(demo.lead.email, DEMO_PASSWORD)
  for (const p of [ada, tamsin]) {
    p.id = (await makeUser(fx.workshopId, 'caster', p.name.split(' ')[0]!.toLowerCase())).id
    await fx.k('users').where({ id: p.id }).update({ name: p.name })
    await setPinDirect(p.id, p.pin)
  }
})
afterAll(async () => {
  await browser?.close()
  await fx?.k('rate_limits').where('key', 'like', 'pin%').del()
  await closeTestDb()
})

/** A pour planned for `casterId` starting this minute on a fresh mould (today, whatever the clock says). */
async function pourFor(casterId: number) {
  const jobItemId = await fx.item(await fx.job(), null)
  const slotStart = new Date(Math.floor(Date.now() / 60_000) * 60_000 - 5 * 60_000).toISOString()
  const r = await call('/api/pours', { method: 'POST', cookie: lead, body: { mouldId: await fx.mould(), slotStart, jobItemId, casterId } })
  expect(r.status, JSON.stringify(r.data)).toBe(201)
  return r.data.id as number
}

/** Who the register names for each step of a pour: [event type, person] in order. */
async function stepsOf(pourId: number) {
  const rows = await fx.k('events as e').leftJoin('users as u', 'u.id', 'e.actor_id')
    .where({ 'e.entity': 'pour', 'e.entity_id': String(pourId) }).whereNot('e.type', 'pour.planned').orderBy('e.id').select('e.type', 'u.name')
  return rows.map(r => [r.type, r.name])
}

const card = (page: Page, id: number) => page.locator(`[data-testid="floor-card"][data-pour-id="${id}"]`)
const stateOf = (page: Page, id: number) => card(page, id).getAttribute('data-state')
async function step(page: Page, id: number, fill: () => Promise<void>) {
  await card(page, id).getByTestId('floor-next').click()
  await fill()
  await card(page, id).getByTestId('floor-submit').click()
}
const startMixing = (page: Page, id: number) => step(page, id, () => card(page, id).getByLabel('Water °C').fill('18'))
const poured = (page: Page, id: number) => step(page, id, () => card(page, id).getByLabel('Shop °C').fill('17'))

async function switchIn(page: Page, p: typeof ada) {
  await page.waitForURL(`${base}/tablet`)
  await page.locator('html[data-hydrated]').waitFor()
  await page.getByRole('button', { name: new RegExp(p.name) }).click()
  const keypad = page.getByTestId('tablet-keypad')
  for (const d of p.pin) await keypad.getByRole('button', { name: d, exact: true }).click()
  await page.getByTestId('tablet-ok').click()
  await page.waitForURL(`${base}/floor`)
  await expect.poll(() => page.getByTestId('user-name').textContent()).toBe(p.name)
}

const pendingText = (page: Page) => page.getByTestId('outbox-pending').textContent()

describe('outbox on a shared tablet', () => {
  let page: Page
  /** POSTs to a pour's action route seen by the browser (aborted ones included). */
  const posts: Request[] = []
  /** Native browser dialogs seen (there must be none: the app asks in its own). */
  const native: string[] = []

  it('each person\'s steps go out under their own session; others\' wait, shown, for them', async () => {
    const pourA = await pourFor(ada.id)
    const pourB = await pourFor(tamsin.id)
    page = await browser.context.newPage()
    // the app asks in its own dialog: a native confirm() would be dismissed here and fail the journey
    page.on('dialog', (d) => {
      native.push(d.message())
      void d.dismiss()
    })
    page.on('request', (r) => {
      if (r.method() === 'POST' && ACTIONS.test(new URL(r.url()).pathname)) posts.push(r)
    })

    // the lead makes this device a shared tablet
    await signInThroughForm(page, base, demo.lead.email, DEMO_PASSWORD, '/lead')
    await gotoHydrated(page, `${base}/lead/people`)
    await page.getByLabel('Name for this device').fill('Outbox owners tablet')
    await page.getByRole('button', { name: 'Use this device as a shared tablet' }).click()
    await page.getByRole('dialog', { name: 'Make this device a shared tablet?' }).getByRole('button', { name: 'Make it a shared tablet' }).click()
    await switchIn(page, ada)
    await card(page, pourA).waitFor()

    // Ada takes two steps with the Wi-Fi down
    await browser.context.setOffline(true)
    await startMixing(page, pourA)
    await expect.poll(() => stateOf(page, pourA)).toBe('mixing')
    await poured(page, pourA)
    await expect.poll(() => stateOf(page, pourA)).toBe('setting')
    await expect.poll(() => pendingText(page)).toMatch(/2 waiting to send/)

    // Switching person needs the server (the PIN is checked there), the action route does not
    // answer yet: as on a shop floor where the access point comes back for a moment, and the
    // steps are still waiting when Ada hands over. Switching no longer waits for them.
    await page.route(isAction, r => r.abort('internetdisconnected'))
    await browser.context.setOffline(false)
    await page.getByTestId('switch-person').click()
    await switchIn(page, tamsin)
    await card(page, pourB).waitFor()
    await startMixing(page, pourB)
    await expect.poll(() => stateOf(page, pourB)).toBe('mixing')
    await expect.poll(() => pendingText(page)).toMatch(/1 waiting to send/)
    await expect.poll(() => page.getByTestId('outbox-others').textContent()).toMatch(/2 steps by Ada Marle wait for Ada Marle to sign in on this tablet/)
    expect((await page.getByTestId('switch-person').boundingBox())!.height).toBeGreaterThanOrEqual(48)
    await screenshot(page, 'outbox-owners-1-waiting-for-other')

    // the connection returns: only Tamsin's step goes out, under Tamsin's name
    await page.unroute(isAction)
    await page.getByRole('button', { name: 'Send now' }).click()
    await expect.poll(() => pendingText(page)).toMatch(/All your actions sent/)
    await expect.poll(() => stepsOf(pourB)).toEqual([['pour.mixing', tamsin.name]])
    expect(await stepsOf(pourA)).toEqual([])
    await expect.poll(() => page.getByTestId('outbox-others').textContent()).toMatch(/2 steps by Ada Marle wait/)
    await page.getByTestId('outbox-toggle').click()
    await expect.poll(() => page.getByTestId('outbox-history').locator('[data-status="pending"]').count()).toBe(2)
    await expect.poll(() => page.getByTestId('outbox-history').textContent()).toMatch(/waiting for Ada Marle/)
    await screenshot(page, 'outbox-owners-2-other-still-waiting')

    // Ada switches in again: her steps go out, in order, under her name
    await page.getByTestId('switch-person').click()
    await switchIn(page, ada)
    await expect.poll(() => pendingText(page), { timeout: 30_000 }).toMatch(/All actions sent/)
    await expect.poll(() => stepsOf(pourA)).toEqual([['pour.mixing', ada.name], ['pour.poured', ada.name]])
    expect(await stepsOf(pourB)).toEqual([['pour.mixing', tamsin.name]])
    expect(await fx.k('pours').where({ id: pourA }).first('state', 'version')).toEqual({ state: 'setting', version: 3 })
    expect(await page.getByTestId('outbox-others').count()).toBe(0)
  }, 180_000)

  it('a 401 stops the outbox at one try and asks for a sign-in; the step waits, then lands under its person', async () => {
    const pour = await pourFor(ada.id)
    await page.goto(`${base}/floor`)
    await card(page, pour).waitFor()
    await browser.context.setOffline(true)
    await startMixing(page, pour)
    await expect.poll(() => pendingText(page)).toMatch(/1 waiting to send/)

    // meanwhile a lead disables Ada: her session on the tablet is over
    expect((await call(`/api/users/${ada.id}`, { method: 'PATCH', cookie: lead, body: { disabled: true } })).status).toBe(200)
    const before = posts.length
    await browser.context.setOffline(false)
    const signInBox = page.getByTestId('outbox-sign-in')
    await expect.poll(() => signInBox.textContent()).toMatch(/Your session has ended, so 1 step by Ada Marle waits on this tablet/)
    expect(posts.length - before).toBe(1)
    expect(await posts.at(-1)!.response().then(r => r?.status())).toBe(401)

    // every way the outbox is woken (the browser's online event, a socket reconnect, the retry
    // timer) goes through flush: none sends again. A request made after them in the same task
    // shows up after any request they would have made.
    const sentinel = page.waitForRequest(r => r.url().endsWith('/api/health'))
    await page.evaluate(async () => {
      for (let i = 0; i < 5; i++) window.dispatchEvent(new Event('online'))
      await fetch('/api/health')
    })
    await sentinel
    expect(posts.length - before).toBe(1)
    // kept as pending, not refused
    const kept = await page.evaluate(() => new Promise<string[]>((resolve, reject) => {
      const open = indexedDB.open('setline-floor')
      open.onerror = () => reject(open.error)
      open.onsuccess = () => {
        const all = open.result.transaction('outbox').objectStore('outbox').getAll()
        all.onsuccess = () => resolve((all.result as { status: string; owner?: { name: string } }[]).filter(e => e.owner?.name === 'Ada Marle').map(e => e.status))
      }
    }))
    expect(kept.filter(s => s === 'pending')).toHaveLength(1)
    expect(kept).not.toContain('refused')
    expect(await stepsOf(pour)).toEqual([])
    const again = page.getByTestId('outbox-sign-in-again')
    expect((await again.boundingBox())!.height).toBeGreaterThanOrEqual(48)
    await screenshot(page, 'outbox-owners-3-sign-in-needed')

    // the lead enables Ada again; she signs in on the tablet and her step lands under her name
    expect((await call(`/api/users/${ada.id}`, { method: 'PATCH', cookie: lead, body: { disabled: false } })).status).toBe(200)
    await again.click()
    await switchIn(page, ada)
    await expect.poll(() => stepsOf(pour)).toEqual([['pour.mixing', ada.name]])
    await expect.poll(() => pendingText(page)).toMatch(/All actions sent/)
    expect(posts.length - before).toBe(2)
    expect(await page.getByTestId('outbox-sign-in').count()).toBe(0)
  }, 180_000)

  it('a step queued before owners were recorded is sent by no one until a lead takes it on', async () => {
    const pour = await pourFor(tamsin.id)
    // an entry as the previous version of the outbox wrote it: no owner
    await page.evaluate(({ pour }) => new Promise<void>((resolve, reject) => {
      const open = indexedDB.open('setline-floor')
      open.onerror = () => reject(open.error)
      open.onsuccess = () => {
        const tx = open.result.transaction('outbox', 'readwrite')
        tx.objectStore('outbox').put({
          id: '6f1c2a3b-4d5e-4f60-8a7b-9c0d1e2f3a4b', url: `/api/pours/${pour}/actions`, pourId: pour, kind: 'start_mixing',
          label: 'Older step · Start mixing', body: { waterTempC: 18, version: 1 }, tappedAt: new Date().toISOString(), status: 'pending', tries: 0,
        })
        tx.oncomplete = () => resolve()
        tx.onerror = () => reject(tx.error)
      }
    }), { pour })
    const before = posts.length
    await page.reload()
    await page.locator('html[data-hydrated]').waitFor()
    await expect.poll(() => page.getByTestId('outbox-unowned').textContent()).toMatch(/1 step from before this tablet recorded who took it waits here\. A lead signs in/)
    const sentinel = page.waitForRequest(r => r.url().endsWith('/api/health'))
    await page.evaluate(async () => {
      window.dispatchEvent(new Event('online'))
      await fetch('/api/health')
    })
    await sentinel
    expect(posts.length - before).toBe(0)
    await screenshot(page, 'outbox-owners-4-older-step')

    // Tamsin does not send it either; a lead signed in on the tablet sends it under the lead's name after confirming
    await page.getByTestId('switch-person').click()
    await switchIn(page, tamsin)
    await expect.poll(() => page.getByTestId('outbox-unowned').count()).toBe(1)
    expect(posts.length - before).toBe(0)
    await page.getByTestId('switch-person').click()
    await page.waitForURL(`${base}/tablet`)
    await signInThroughForm(page, base, demo.lead.email, DEMO_PASSWORD, '/lead')
    await gotoHydrated(page, `${base}/floor`)
    // the app's own question first: "Not now" sends nothing; the lead then confirms
    await page.getByTestId('outbox-send-unowned').click()
    const question = page.locator('[data-testid="ask-dialog"][open]')
    await expect.poll(() => question.getByRole('heading').textContent()).toBe('Send it under your name?')
    await expect(question.textContent()).resolves.toContain('The register will name you for it.')
    await screenshot(page, 'outbox-owners-5-ask')
    await question.getByRole('button', { name: 'Not now' }).click()
    await expect.poll(() => question.count()).toBe(0)
    expect(posts.length - before).toBe(0)
    await page.getByTestId('outbox-send-unowned').click()
    await question.getByRole('button', { name: 'Send it under my name' }).click()
    await expect.poll(() => stepsOf(pour)).toEqual([['pour.mixing', demo.lead.name]])
    await expect.poll(() => page.getByTestId('outbox-unowned').count()).toBe(0)
    expect(posts.length - before).toBe(1)
    expect(native).toEqual([])
    await page.close()
  }, 180_000)
})
