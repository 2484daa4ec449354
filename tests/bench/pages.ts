/**
 * The JavaScript each main page ships (plain tsx script; `npm run bench` runs it through run.ts).
 * Debian's chromium (tests/setup/browser.ts) loads each page with the browser cache off, signed in
 * as the role the page is for; every JavaScript file fetched is gzipped here (zlib's default
 * level, as a server would send it) and summed once per URL. Two loads per page:
 *  - "to run": with the browser saying Save-Data, so NuxtLink does not fetch the pages its
 *    visible links lead to (nuxt-link.js skips that on a slow or save-data connection); the
 *    scripts the page runs, without the rel=prefetch hints Chrome fetches at idle;
 *  - "downloaded": an ordinary load left to settle, everything the tablet fetches, speculative
 *    link and rel=prefetch fetches for later pages included. This is the figure held to the target.
 * The caster's page (/floor) is checked for FullCalendar code, which belongs to the lead's board
 * only: its chunks carry FullCalendar's own class names. Target: the caster page under 200 KB of
 * gzip JavaScript. Prints figures; never asserts.
 */
import { gzipSync } from 'node:zlib'
import type { BrowserContext } from 'playwright-core'
import { openBrowser, VIEWPORTS } from '../setup/browser'
import { benchDatabase, DEMO_PASSWORD, DEMO_USERS, signIn, startBenchServer } from './lib/app'
import { record } from './lib/results'

const CASTER_TARGET_KB = 200
/** Strings only FullCalendar's code carries (its CSS class names and licence notice). */
const CALENDAR = /fc-timeline|fc-license-message|@fullcalendar/
/** How long an ordinary load is left after hydration for idle-time prefetches to start. */
const SETTLE_MS = 2500

const email = (key: string) => DEMO_USERS.find(u => u.key === key)!.email

interface JsFile { name: string; bytes: number; gzip: number; calendar: boolean; script: boolean }

async function load(context: BrowserContext, base: string, path: string, cookie: string | undefined, saveData: boolean): Promise<JsFile[]> {
  await context.clearCookies()
  if (cookie) {
    const [name, value] = cookie.split('=') as [string, string]
    await context.addCookies([{ name, value, url: base }])
  }
  const page = await context.newPage()
  const cdp = await context.newCDPSession(page)
  await cdp.send('Network.setCacheDisabled', { cacheDisabled: true })
  if (saveData) {
    await page.addInitScript(() => Object.defineProperty(navigator, 'connection', { value: { saveData: true, effectiveType: '4g' } }))
  }
  const bodies = new Map<string, Promise<Omit<JsFile, 'script'> | undefined>>()
  const scripts = new Set<string>()
  page.on('response', (res) => {
    const url = new URL(res.url())
    if (!url.pathname.endsWith('.js') && !(res.headers()['content-type'] ?? '').includes('javascript')) return
    // a chunk hinted with rel=prefetch and imported later is fetched twice (the cache is off): once as a script
    if (res.request().resourceType() === 'script') scripts.add(url.pathname)
    if (bodies.has(url.pathname)) return
    bodies.set(url.pathname, res.body().then(body => ({
      name: url.pathname.split('/').pop()!, bytes: body.length, gzip: gzipSync(body).length, calendar: CALENDAR.test(body.toString('utf8')),
    })).catch(() => undefined))
  })
  const res = await page.goto(base + path, { waitUntil: 'networkidle' })
  if (!res?.ok()) throw new Error(`${path} answered ${res?.status()}`)
  const landed = new URL(page.url()).pathname
  if (landed !== path) throw new Error(`${path} landed on ${landed}`)
  await page.locator('html[data-hydrated]').waitFor()
  await page.waitForLoadState('networkidle')
  if (!saveData) {
    await page.waitForTimeout(SETTLE_MS)
    await page.waitForLoadState('networkidle')
  }
  const files = await Promise.all([...bodies].map(async ([url, body]) => {
    const f = await body
    return f && { ...f, script: scripts.has(url) }
  }))
  await page.close()
  return files.filter(f => !!f)
}

const kb = (files: JsFile[]) => files.reduce((s, f) => s + f.gzip, 0) / 1024

async function main() {
  const db = await benchDatabase()
  const app = await startBenchServer(db.url)
  const browser = await openBrowser(VIEWPORTS.tablet)
  try {
    const cookies: Record<string, string> = {}
    for (const key of ['lead', 'caster1', 'finisher', 'client1']) cookies[key] = await signIn(app.url, email(key), DEMO_PASSWORD)
    const jobs = await fetch(`${app.url}/api/client/jobs`, { headers: { cookie: cookies.client1! } }).then(r => r.json()) as { id: number }[]
    const jobId = jobs[0]?.id
    if (!jobId) throw new Error('the demo client has no job')
    const visits: [string, string, string | undefined][] = [
      ['/login', 'signed out', undefined],
      ['/lead', 'lead', cookies.lead],
      ['/lead/board', 'lead', cookies.lead],
      ['/floor', 'caster', cookies.caster1],
      ['/finishing', 'finisher', cookies.finisher],
      ['/client', 'client', cookies.client1],
      [`/client/jobs/${jobId}`, 'client', cookies.client1],
      ['/mix', 'caster', cookies.caster1],
    ]
    console.log('JavaScript per page, gzip KB (zlib default level), cache off; tablet viewport')
    console.log(`  ${'page'.padEnd(18)} ${'role'.padEnd(11)} ${'to run'.padStart(7)} ${'downloaded'.padStart(11)} ${'files'.padStart(6)}  FullCalendar code`)
    let floorCalendar: string[] = []
    let boardCalendar: string[] = []
    for (const [path, role, cookie] of visits) {
      const run = (await load(browser.context, app.url, path, cookie, true)).filter(f => f.script)
      const all = await load(browser.context, app.url, path, cookie, false)
      const calendar = [...new Set([...run, ...all].filter(f => f.calendar).map(f => f.name))]
      const [runKb, allKb] = [kb(run), kb(all)]
      console.log(`  ${path.padEnd(18)} ${role.padEnd(11)} ${runKb.toFixed(0).padStart(7)} ${allKb.toFixed(0).padStart(11)} ${String(all.length).padStart(6)}  ${calendar.length ? `yes: ${calendar.join(', ')}` : 'no'}`)
      if (path === '/floor') floorCalendar = calendar
      if (path === '/lead/board') boardCalendar = calendar
      const name = path.startsWith('/client/jobs/') ? '/client/jobs/[id]' : path
      const isFloor = path === '/floor'
      record({
        name: `JS shipped, ${name} (${role}), gzip`,
        value: `${allKb.toFixed(0)} KB`,
        target: isFloor ? `< ${CASTER_TARGET_KB} KB` : undefined,
        met: isFloor ? allKb < CASTER_TARGET_KB : undefined,
        note: `${runKb.toFixed(0)} KB to run, the rest prefetched for linked pages; ${all.length} files${calendar.length ? `; FullCalendar in ${calendar.join(', ')}` : ''}`,
      })
    }
    console.log(`caster page (/floor) loads FullCalendar code: ${floorCalendar.length ? `yes (${floorCalendar.join(', ')})` : 'no'}`)
    console.log(`  (the lead's board loads it in: ${boardCalendar.join(', ') || 'none found: check the CALENDAR markers'})`)
    record({
      name: 'caster page (/floor) free of FullCalendar code',
      value: floorCalendar.length ? `no: ${floorCalendar.join(', ')}` : 'yes',
      target: 'yes',
      met: !floorCalendar.length,
      note: `the board's calendar chunk: ${boardCalendar.join(', ')}`,
    })
  }
  finally {
    await browser.close()
    await app.stop()
    db.stop()
  }
}

main().catch((err) => {
  console.error(err)
  process.exit(1)
})
