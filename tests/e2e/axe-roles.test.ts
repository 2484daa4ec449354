// Every page each role can reach, checked with axe-core (tests/setup/axe.ts): the lead on a
// desktop, the caster and the finisher on a tablet-sized screen (820×1180, as the shared
// tablets), the client and the lead on a phone. Each walks its whole navigation plus the pages
// one link deeper that the navigation leads to (a job, its register, a mould, a dispatch note,
// the client's job) and their account; no page may have a serious or critical violation, nor
// run past the screen's right edge. The pour board is checked once its timeline has drawn (it
// is drawn in the browser only), in the day and the week view; on a phone first as the
// server's sketch with its list of pours, before the timeline is asked for. The caster's pages are also walked after a switch-in by PIN on the shared
// tablet (tablet.test.ts).
// On the finisher's tablet every control is also measured: at least 44 × 44 CSS px (WCAG 2.2
// success criterion 2.5.5, target size, enhanced), as the floor's are measured in floor.test.ts.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Page } from 'playwright-core'
import { VIEWPORTS, openBrowser, screenshot, signInThroughForm, gotoHydrated } from '../setup/browser'
import { seriousAxeViolations } from '../setup/axe'
import { DEMO_PASSWORD, closeTestDb, demo, testDb } from '../setup/fixtures'
import { testContext } from '../setup/context'

const base = testContext().baseUrl
afterAll(closeTestDb)

// The pages a phone or tablet opens most call no Intl while they load: a page's first Intl call
// loads ICU, 150-250 ms at 4x CPU (shared/utils/workshop-format.ts). Each document records the
// calls made before the app marks itself hydrated, with the caller's frame.
const ICU_WATCH = `
  window.__icu = []
  const note = (what) => { if (!document.documentElement.hasAttribute('data-hydrated')) window.__icu.push(what + ' at ' + ((new Error().stack || '').split('\\n')[3] || '').trim()) }
  for (const name of ['DateTimeFormat', 'NumberFormat', 'Collator', 'PluralRules', 'RelativeTimeFormat', 'ListFormat', 'Segmenter']) {
    const C = Intl[name]
    if (C) Intl[name] = new Proxy(C, { construct(t, a) { note('Intl.' + name); return Reflect.construct(t, a) } })
  }
  for (const [o, m] of [[String.prototype, 'localeCompare'], [Date.prototype, 'toLocaleString'], [Date.prototype, 'toLocaleDateString'], [Date.prototype, 'toLocaleTimeString'], [Number.prototype, 'toLocaleString']]) {
    const f = o[m]
    o[m] = function (...a) { note(m); return f.apply(this, a) }
  }`
/** Intl calls made before hydration, by path, for the pages listed in NO_ICU. */
const icuSeen: Record<string, string[]> = {}
const NO_ICU = [/^\/lead$/, /^\/floor$/, /^\/finishing$/, /^\/mix$/, /^\/client\/jobs\/\d+$/]

// The same pages and the board load no validation library: their forms load their zod schemas when they open
// (shared/utils/floor-steps.ts and the like hold what the pages show). Checked on the scripts the
// page's HTML names (its entry and the modulepreload links of its own chunks), by a string zod's
// code carries, so a bundle that pulls zod in again under any chunk name is caught.
const ZOD_MARK = '"ZodCustom"'
const zodSeen: Record<string, string[]> = {}
async function zodScripts(page: Page, path: string) {
  const html = await (await page.request.get(`${base}${path}`)).text()
  const srcs = [...html.matchAll(/<(?:link rel="modulepreload"[^>]*href|script[^>]*src)="([^"]+\.js)"/g)].map(m => m[1]!)
  expect(srcs.length, `${path}: the scripts its HTML names`).toBeGreaterThan(0)
  const withZod: string[] = []
  for (const src of new Set(srcs)) if ((await (await page.request.get(new URL(src, base).href)).text()).includes(ZOD_MARK)) withZod.push(src)
  return withZod
}

/** Opens each path after hydration and collects its serious and critical axe violations. */
async function axeWalk(page: Page, paths: string[]) {
  const found: Record<string, string[]> = {}
  for (const path of paths) {
    await gotoHydrated(page, `${base}${path}`)
    await page.locator('main').waitFor()
    if (NO_ICU.some(rx => rx.test(path))) {
      icuSeen[path] = await page.evaluate(() => (window as unknown as { __icu: string[] }).__icu)
      zodSeen[path] = await zodScripts(page, path)
    }
    const v = await seriousAxeViolations(page)
    // nothing pushes the page sideways at this width (wide tables scroll in their own region)
    const over = await page.evaluate(() => document.documentElement.scrollWidth - document.documentElement.clientWidth)
    if (over > 0) v.push(`the page runs ${over} px past the screen's right edge`)
    if (v.length) found[path] = v
  }
  return found
}

/** The navigation's own links, as the signed-in person sees them. */
async function navPaths(page: Page) {
  await page.locator('nav a[href^="/"]').first().waitFor({ state: 'attached' })
  const hrefs = await page.locator('nav a[href^="/"]').evaluateAll(as => as.map(a => a.getAttribute('href')!))
  return [...new Set(hrefs)]
}

/** Follows the sidebar's Jobs link; true when the page changed in place (the links are hydrated). */
async function sidebarNavigatesInPlace(page: Page) {
  await page.evaluate(() => ((window as unknown as { kept: boolean }).kept = true))
  // hydrated at idle: clicked before, the link would load the page whole, as a plain link does
  await page.locator('nav[aria-label="Main"][data-links-live]').waitFor({ state: 'attached', timeout: 15_000 })
  await page.locator('nav[aria-label="Main"] a[href="/lead/jobs"]').click()
  await page.getByRole('heading', { level: 1, name: 'Jobs' }).waitFor()
  return page.evaluate(() => (window as unknown as { kept?: boolean }).kept === true)
}

async function journey(viewport: { width: number; height: number }, email: string, run: (page: Page) => Promise<void>) {
  const browser = await openBrowser(viewport)
  try {
    const page = await browser.context.newPage()
    await page.addInitScript(ICU_WATCH)
    await signInThroughForm(page, base, email, DEMO_PASSWORD)
    await page.locator('html[data-hydrated]').waitFor()
    await run(page)
  }
  finally {
    await browser.close()
  }
}

describe('axe on every page of every role', () => {
  let deeper: { lead: string[]; client: string[] }
  /**
   * A day of the board with demo pours on it: the first planned one's mixing day, in the workshop's zone.
   * The demo is seeded around the day it was made, and a run that crosses midnight would find
   * today's board empty (a clean-clone run that started at 23:58 did).
   */
  let boardDay: string
  beforeAll(async () => {
    const k = testDb()
    const lead = await k('users').where({ email: demo.lead.email }).first('workshop_id')
    boardDay = (await k('pours').join('workshops', 'workshops.id', 'pours.workshop_id').where({ 'pours.workshop_id': lead.workshop_id, 'pours.state': 'planned' })
      .orderBy('pours.mix_at').first(k.raw(`to_char(pours.mix_at AT TIME ZONE workshops.timezone, 'YYYY-MM-DD') AS day`))).day
    const job = await k('jobs').orderBy('id').first('id')
    const mould = await k('moulds').orderBy('id').first('id')
    const dispatch = await k('dispatches').orderBy('id').first('id')
    const client = await k('users').where({ email: demo.client1.email }).first('id')
    const clientJobs = await k('job_members').where({ user_id: client.id }).orderBy('job_id').pluck('job_id')
    deeper = {
      lead: [`/lead/jobs/${job.id}`, `/lead/jobs/${job.id}/register`, `/lead/moulds/${mould.id}`, ...(dispatch ? [`/dispatches/${dispatch.id}`] : []), '/account'],
      client: [...clientJobs.slice(0, 2).map(id => `/client/jobs/${id}`), '/account'],
    }
  })

  it('the lead, on a desktop', async () => {
    await journey(VIEWPORTS.desktop, demo.lead.email, async (page) => {
      const nav = await navPaths(page)
      expect(nav).toEqual(expect.arrayContaining(['/lead', '/lead/board', '/lead/settings', '/finishing']))
      await expect(sidebarNavigatesInPlace(page)).resolves.toBe(true)
      expect(await axeWalk(page, [...nav.filter(p => p !== '/lead/board'), ...deeper.lead])).toEqual({})
      // the pour board, once its timeline is drawn, in the day and the week view, on this
      // desktop and at the tablet's and the phone's widths, where its timeline scrolls sideways
      // and its scrollers take focus
      zodSeen['/lead/board'] = await zodScripts(page, '/lead/board')
      for (const size of ['desktop', 'tablet', 'phone'] as const) {
        await page.setViewportSize(VIEWPORTS[size])
        for (const view of ['day', 'week']) {
          await gotoHydrated(page, `${base}/lead/board?view=${view}&date=${boardDay}`)
          if (size === 'phone') {
            // a phone gets the server's sketch and the list of pours; the calendar when asked for
            await page.getByTestId('board-pour-list').getByRole('button', { name: /^(Move|Open) pour/ }).first().waitFor()
            await expect(page.locator('.fc-scrollgrid').count(), `${size} ${view}: no calendar before it is asked for`).resolves.toBe(0)
            await expect(page.evaluate(() => document.documentElement.scrollWidth - document.documentElement.clientWidth), `${size} ${view}: nothing past the right edge`).resolves.toBeLessThanOrEqual(0)
            expect(await seriousAxeViolations(page), `${size} ${view}, the sketch`).toEqual([])
            await page.getByTestId('board-open-timeline').click()
          }
          await page.locator('.fc-scrollgrid').first().waitFor()
          expect(await seriousAxeViolations(page), `${size} ${view}`).toEqual([])
          if (size !== 'desktop') await expect(page.locator('.setline-board .fc-scroller[tabindex="0"][role="region"]').count(), `${size} ${view}: a focusable scroller`).resolves.toBeGreaterThan(0)
        }
      }
      // an address that leads nowhere keeps the signed-in shell and says so in plain words
      await page.setViewportSize(VIEWPORTS.desktop)
      await gotoHydrated(page, `${base}/lead/no-such-page`)
      await expect(page.getByRole('heading', { level: 1 }).textContent()).resolves.toBe('Nothing here')
      await expect(page.locator('nav[aria-label="Main"]').getByRole('link', { name: 'Pour board' }).isVisible()).resolves.toBe(true)
      expect(await page.getByTestId('error-page').textContent()).not.toMatch(/no-such-page|Page not found/)
      expect(await seriousAxeViolations(page), 'the page for an unknown address').toEqual([])
      await page.getByRole('button', { name: 'Go to your start page' }).click()
      await page.waitForURL(u => !u.pathname.includes('no-such-page'))
    })
  }, 300_000)

  it('the lead, on a phone with the menu open', async () => {
    await journey(VIEWPORTS.phone, demo.lead.email, async (page) => {
      await page.getByRole('button', { name: 'Menu' }).click()
      await page.locator('nav a[href="/lead/jobs"]').first().waitFor()
      expect(await seriousAxeViolations(page)).toEqual([])
      // the header holds the menu, the live status and the account on a phone without running off it
      expect(await axeWalk(page, ['/lead', '/lead/jobs', '/day-sheet'])).toEqual({})
      // the sidebar, hidden on a phone and not hydrated there, comes alive when the screen
      // widens: its link then changes the page in place (the window's own mark survives)
      await page.setViewportSize(VIEWPORTS.desktop)
      await expect(sidebarNavigatesInPlace(page)).resolves.toBe(true)
    })
  }, 120_000)

  it('the caster, on a tablet', async () => {
    await journey(VIEWPORTS.tablet, demo.caster1.email, async (page) => {
      const nav = await navPaths(page)
      expect(nav).toEqual(expect.arrayContaining(['/floor', '/day-sheet', '/mix', '/cautions']))
      expect(await axeWalk(page, [...nav, '/account'])).toEqual({})
    })
  }, 180_000)

  it('the finisher, on a tablet, with every control of the queue and its forms at least 44 px', async () => {
    await journey(VIEWPORTS.tablet, demo.finisher.email, async (page) => {
      const nav = await navPaths(page)
      expect(nav).toEqual(expect.arrayContaining(['/finishing', '/cautions']))
      expect(await axeWalk(page, [...nav, '/account'])).toEqual({})

      await gotoHydrated(page, `${base}/finishing`)
      const small = () => page.locator('main').evaluate((main) => {
        const controls = main.querySelectorAll('a, button, select, input:not([type=checkbox]):not([type=radio]), label:has(input[type=checkbox]), label:has(input[type=radio])')
        return Array.from(controls).map((el) => {
          const r = el.getBoundingClientRect()
          return { what: `${el.tagName.toLowerCase()} "${(el.textContent ?? '').trim().slice(0, 40) || el.getAttribute('aria-label') || el.getAttribute('name')}"`, w: r.width, h: r.height }
        }).filter(c => c.w > 0 && c.h > 0 && (c.w < 44 || c.h < 44))
      })
      const tabs = page.locator('[role="tab"]')
      const found: Record<string, unknown[]> = {}
      for (let i = 0; i < await tabs.count(); i++) {
        await tabs.nth(i).click()
        const label = (await tabs.nth(i).innerText()).split('\n')[0]!
        const s = await small()
        if (s.length) found[label] = s
        // each step's form, opened (and left unsent)
        const next = page.getByTestId('piece-next').first()
        if (await next.count()) {
          await next.click()
          await page.getByTestId('finishing-submit').first().waitFor()
          const f = await small()
          if (f.length) found[`${label}, form`] = f
          expect(await seriousAxeViolations(page)).toEqual([])
          await page.getByRole('button', { name: 'Cancel' }).first().click()
        }
      }
      await screenshot(page, 'finishing-tap-targets')
      expect(found).toEqual({})
    })
  }, 240_000)

  it('the client, on a phone', async () => {
    await journey(VIEWPORTS.phone, demo.client1.email, async (page) => {
      expect(await axeWalk(page, ['/client', ...deeper.client])).toEqual({})
    })
  }, 180_000)

  it('Today, the floor, the mix card, finishing and a client\'s job call no Intl before they hydrate', () => {
    // filled by the walks above (this test runs after them, in file order)
    expect(Object.keys(icuSeen).sort()).toEqual(['/finishing', '/floor', '/lead', '/mix', ...deeper.client.filter(p => p.startsWith('/client/jobs/'))].sort())
    expect(Object.fromEntries(Object.entries(icuSeen).filter(([, calls]) => calls.length))).toEqual({})
  })

  it('the same pages and the board load no zod until a form opens', () => {
    expect(Object.keys(zodSeen).sort()).toEqual([...Object.keys(icuSeen), '/lead/board'].sort())
    expect(Object.fromEntries(Object.entries(zodSeen).filter(([, scripts]) => scripts.length))).toEqual({})
  })
})
