/**
 * Board benchmark (plain tsx script; `npm run bench` runs it through run.ts). A throwaway
 * PostgreSQL (lib/app.ts) with a synthetic workshop of 60 moulds on 6 benches and 1,500 pours
 * over 14 days; the built server (run `npm test` or `npx nuxt build` first) answers GET
 * /api/board for the 14 days, timed beside the raw SQL that reads the same pour rows (200 of
 * each after 10 warm-ups, taking turns, so the machine's busy moments fall on both). Prints
 * p50/p95 and the ratio (target: within 1.5x of raw SQL at p95, p95 at most 30 ms). Then in
 * Debian's chromium (tests/setup/browser.ts): the first pour bar drawn on /lead/board (week
 * view of the seeded week) at 4x CPU slowdown (CDP Emulation.setCPUThrottlingRate), the time
 * from navigation start to the first animation frame after a bar entered the document (a
 * MutationObserver in the page, read from the page's performance clock), median of 3 cold
 * loads after one that is not counted (the server's first render of the page loads its code): the first bar of any kind (the server draws the first screen, BoardSketch), and
 * beside it the first bar of the calendar itself (the board a lead can drag on); and
 * a live change reaching another open board: a PATCH moves one pour and the bar's position
 * is watched in the page (MutationObserver), measured from just before the PATCH is sent to
 * the bar moving, so it includes the request, the commit and the socket event. And the board's
 * layout shift (CLS): the page's layout-shift entries (Layout Instability API, those without
 * recent input) summed from navigation until the network is idle after the first bar, at 4x
 * CPU slowdown, on a 1440 px desktop and a 412 px phone (Lighthouse's mobile width), median of
 * 3 each. The sum is an upper bound of Lighthouse's CLS (its largest 5 s session window).
 * Never asserts.
 */
import { performance } from 'node:perf_hooks'
import { randomUUID } from 'node:crypto'
import knex from 'knex'
import { Hash } from '@adonisjs/hash'
import { Scrypt } from '@adonisjs/hash/drivers/scrypt'
import { SCRYPT_OPTIONS } from '../../server/utils/password-policy'
import { GRADE_PRESETS } from '#shared/utils/plaster'
import { benchDatabase, signIn, startBenchServer, type BenchServer } from './lib/app'
import { percentile } from './lib/stats'
import { record } from './lib/results'
import { openBrowser } from '../setup/browser'

const RUNS = 200
const WARM_UPS = 10
const FROM = '2027-03-01'
const TO = '2027-03-14'
const EMAIL = `bench-lead-${randomUUID().slice(0, 8)}@bench.example.test`

async function seed(url: string) {
  const k = knex({ client: 'pg', connection: url })
  const [ws] = await k('workshops').insert({ name: 'Bench workshop' }).returning('id')
  const w = ws.id
  const hash = await new Hash(new Scrypt(SCRYPT_OPTIONS)).make('bench-password-1')
  await k('users').insert({ workshop_id: w, email: EMAIL, name: 'Bench lead', role: 'lead', password_hash: hash })
  const g = GRADE_PRESETS['beta-casting']
  const [grade] = await k('plaster_grades').insert({
    workshop_id: w, name: 'Bench grade', form: g.form, powder_density: g.powderDensity, consistency_min: g.consistency.min,
    consistency_max: g.consistency.max, consistency_default: g.consistency.default, demould_minutes_ref: g.demouldMinutesRef,
    set_time_water_exponent: g.setTimeWaterExponent, temperature_factors: JSON.stringify(g.temperatureFactors),
    hydration_heat: g.hydrationHeat, set_expansion_pct: g.setExpansionPct, purity: g.purity,
  }).returning('id')
  // 6 benches, 60 moulds, one job with an item per mould, 25 one-hour pours per mould over 14 days
  await k.raw(`INSERT INTO benches (workshop_id, name, sort_order) SELECT ?, 'Bench ' || b, b FROM generate_series(1, 6) b`, [w])
  await k.raw(`INSERT INTO moulds (workshop_id, bench_id, code, casts, material, cavity_litres)
    SELECT ?, (SELECT id FROM benches WHERE workshop_id = ? AND sort_order = 1 + (m % 6)), 'M' || lpad(m::text, 3, '0'), 'Synthetic', 'silicone', 4
    FROM generate_series(1, 60) m`, [w, w])
  const [job] = await k('jobs').insert({ workshop_id: w, code: 'B-1', title: 'Bench job' }).returning('id')
  await k.raw(`INSERT INTO job_items (workshop_id, job_id, mould_id, description, quantity, pieces_needed, grade_id, consistency)
    SELECT ?, ?, id, 'Item for ' || code, 25, 25, ?, 70 FROM moulds WHERE workshop_id = ?`, [w, job.id, grade.id, w])
  await k.raw(`INSERT INTO pours (workshop_id, job_item_id, mould_id, grade_id, consistency, slot, mix_at, demould_open_at, demould_close_at, plaster_kg_planned, water_kg_planned)
    SELECT ?, i.id, m.id, ?, 70,
      tstzrange(t, t + interval '1 hour'), t + interval '10 minutes', t + interval '45 minutes', t + interval '3 hours', 3.7, 2.6
    FROM moulds m JOIN job_items i ON i.mould_id = m.id, generate_series(0, 24) n,
      LATERAL (SELECT timestamptz '2027-03-01 07:30+00' + (n / 2) * interval '1 day' + (n % 2) * interval '4 hours' AS t) s
    WHERE m.workshop_id = ?`, [w, grade.id, w])
  const count = Number((await k('pours').where({ workshop_id: w }).count('* as n').first())!.n)
  // the statistics a live database keeps (autovacuum's ANALYZE): without them PostgreSQL plans
  // the board's piece count over freshly inserted tables as if they were empty (measured: the
  // board's statement 57 → 35 ms p50 once analysed)
  await k.raw('ANALYZE')
  await k.destroy()
  return { workshopId: Number(w), pours: count }
}

async function main() {
  const db = await benchDatabase()
  let app: BenchServer | undefined
  try {
    const { workshopId, pours } = await seed(db.url)
    app = await startBenchServer(db.url)
    const cookie = await signIn(app.url, EMAIL, 'bench-password-1')
    const k = knex({ client: 'pg', connection: db.url, pool: { min: 1, max: 1 } })
    const rawSql = () => k.raw(`SELECT p.*, m.code, b.name AS bench, g.name AS grade, j.code AS job, i.description
        FROM pours p JOIN moulds m ON m.id = p.mould_id LEFT JOIN benches b ON b.id = m.bench_id
        JOIN plaster_grades g ON g.id = p.grade_id LEFT JOIN job_items i ON i.id = p.job_item_id LEFT JOIN jobs j ON j.id = i.job_id
        WHERE p.workshop_id = ? AND p.state <> 'void' AND p.slot && tstzrange(?::timestamptz, ?::timestamptz)`, [workshopId, `${FROM}T00:00:00Z`, '2027-03-15T00:00:00Z'])
    // the request and the raw query take turns, so a busy moment of the machine falls on both
    // series alike rather than on whichever ran then
    const api: number[] = []
    const sql: number[] = []
    let rows = 0
    for (let i = 0; i < RUNS + WARM_UPS; i++) {
      let t = performance.now()
      const r = await fetch(`${app.url}/api/board?from=${FROM}&to=${TO}`, { headers: { cookie } })
      const body = await r.json() as { pours: unknown[] }
      if (i >= WARM_UPS) api.push(performance.now() - t)
      rows = body.pours.length
      t = performance.now()
      await rawSql()
      if (i >= WARM_UPS) sql.push(performance.now() - t)
    }
    await k.destroy()
    const [a50, a95, s50, s95] = [percentile(api, 50), percentile(api, 95), percentile(sql, 50), percentile(sql, 95)]
    console.log(`board data, 60 moulds x 14 days: ${pours} pours seeded, ${rows} returned; ${RUNS} timed requests, each beside one raw query, after ${WARM_UPS} warm-ups`)
    console.log(`  GET /api/board  p50 ${a50.toFixed(1)} ms  p95 ${a95.toFixed(1)} ms   (target p95 ≤ 30 ms)`)
    console.log(`  raw SQL         p50 ${s50.toFixed(1)} ms  p95 ${s95.toFixed(1)} ms`)
    console.log(`  ratio           p50 ${(a50 / s50).toFixed(2)}x   p95 ${(a95 / s95).toFixed(2)}x   (target p95 within 1.5x)`)
    record({ name: 'board data, 60 moulds × 14 days: p95', value: `${a95.toFixed(1)} ms`, target: '≤ 30 ms', met: a95 <= 30, note: `p50 ${a50.toFixed(1)} ms` })
    record({ name: 'board data vs raw SQL', value: `${(a50 / s50).toFixed(2)}× (p50), ${(a95 / s95).toFixed(2)}× (p95)`, target: '≤ 1.5× at p95', met: a95 / s95 <= 1.5, note: `raw SQL p50 ${s50.toFixed(1)} ms, p95 ${s95.toFixed(1)} ms` })
    await browserFigures(app.url, cookie, workshopId, db.url)
  }
  finally {
    await app?.stop()
    db.stop()
  }
}

/** The layout shift of one cold load: every layout-shift entry without recent input, summed. */
async function layoutShift(context: Awaited<ReturnType<typeof openBrowser>>['context'], url: string, viewport: { width: number; height: number }) {
  const page = await context.newPage()
  await page.setViewportSize(viewport)
  const cdp = await context.newCDPSession(page)
  await cdp.send('Network.setCacheDisabled', { cacheDisabled: true })
  await cdp.send('Emulation.setCPUThrottlingRate', { rate: 4 })
  await page.addInitScript(() => {
    const w = window as unknown as { cls: number }
    w.cls = 0
    new PerformanceObserver((list) => {
      for (const e of list.getEntries() as (PerformanceEntry & { value: number; hadRecentInput: boolean })[]) if (!e.hadRecentInput) w.cls += e.value
    }).observe({ type: 'layout-shift', buffered: true })
  })
  await page.goto(url)
  // a wide screen draws the calendar; a phone keeps the server's sketch and shows the list of
  // pours beside it (the calendar waits until the lead asks for it)
  await page.locator(viewport.width < 640 ? '[data-testid="board-pour-list"]' : '[data-testid="pour-bar"]').first().waitFor({ timeout: 60_000 })
  await page.waitForLoadState('networkidle')
  const cls = await page.evaluate(() => (window as unknown as { cls: number }).cls)
  await page.close()
  return cls
}

/** First bar at 4x CPU slowdown (median of 3) and the live patch from PATCH to bar moved. */
async function browserFigures(base: string, cookie: string, workshopId: number, url: string) {
  const browser = await openBrowser({ width: 1440, height: 900 })
  try {
    const [name, value] = cookie.split(';')[0]!.split('=') as [string, string]
    await browser.context.addCookies([{ name, value, url: base }])
    const firstBar: number[] = []
    const firstCalendarBar: number[] = []
    // when the page's first byte came (Navigation Timing's responseStart): on this machine the
    // server renders the page on the same two cores the browser is starting the page on, so a
    // slow first bar is often a slow answer
    const pageAnswer: number[] = []
    // one load first, not counted, as the data figure's warm-ups: the server's first render of
    // the page loads its code (a cold start the shop's running server has long paid)
    for (let i = -1; i < 3; i++) {
      const page = await browser.context.newPage()
      const cdp = await browser.context.newCDPSession(page)
      await cdp.send('Network.setCacheDisabled', { cacheDisabled: true })
      await cdp.send('Emulation.setCPUThrottlingRate', { rate: 4 })
      // stamped in the page: the first animation frame after a bar entered the document (its
      // paint follows that frame's callbacks), not when this script next gets to ask, which
      // waits behind whatever the page does after the first bar; any bar (the server's sketch
      // or the calendar's), and the calendar's own
      // (a script's text: tsx names the helpers of a function it compiles, and the page has no
      // such helper)
      await page.addInitScript(`{
        const seen = new Set()
        function stamp(key, selector) {
          if (seen.has(key) || !document.querySelector(selector)) return
          seen.add(key)
          requestAnimationFrame(() => { window[key] = performance.now() })
        }
        new MutationObserver(() => {
          stamp('firstBar', '[data-testid="pour-bar"], [data-testid="board-sketch"] [data-p]')
          stamp('firstCalendarBar', '[data-testid="pour-bar"]')
        }).observe(document, { subtree: true, childList: true })
      }`)
      await page.goto(`${base}/lead/board?view=week&date=${FROM}`)
      await page.waitForFunction(() => (window as unknown as { firstCalendarBar?: number }).firstCalendarBar !== undefined, undefined, { timeout: 60_000 })
      const stamps = await page.evaluate(() => {
        const w = window as unknown as { firstBar: number; firstCalendarBar: number }
        const nav = window.performance.getEntriesByType('navigation')[0] as PerformanceNavigationTiming | undefined
        return { firstBar: w.firstBar, firstCalendarBar: w.firstCalendarBar, pageAnswer: nav?.responseStart ?? NaN }
      })
      if (i >= 0) {
        firstBar.push(stamps.firstBar)
        firstCalendarBar.push(stamps.firstCalendarBar)
        pageAnswer.push(stamps.pageAnswer)
      }
      await page.close()
    }
    const med = [...firstBar].sort((a, b) => a - b)[1]!
    for (const [label, size] of [['desktop 1440 px', { width: 1440, height: 900 }], ['phone 412 px', { width: 412, height: 823 }]] as const) {
      const shifts: number[] = []
      for (let i = 0; i < 3; i++) shifts.push(await layoutShift(browser.context, `${base}/lead/board?view=week&date=${FROM}`, size))
      const cls = [...shifts].sort((a, b) => a - b)[1]!
      console.log(`  board layout shift, ${label}, 4x CPU: median ${cls.toFixed(3)} of ${shifts.map(x => x.toFixed(3)).join(', ')}   (target ≤ 0.1)`)
      record({ name: `board layout shift (CLS upper bound), ${label}, 4× CPU (median of 3)`, value: cls.toFixed(3), target: '≤ 0.1', met: cls <= 0.1, note: `runs ${shifts.map(x => x.toFixed(3)).join(', ')}` })
    }
    const secs = (xs: number[]) => xs.map(x => (x / 1000).toFixed(2)).join(', ')
    const medCalendar = [...firstCalendarBar].sort((a, b) => a - b)[1]!
    console.log(`  first pour bar on /lead/board at 4x CPU slowdown: median ${(med / 1000).toFixed(2)} s of ${secs(firstBar)} s   (target ≤ 1.5 s)`)
    console.log(`    the page's first byte in those loads: ${secs(pageAnswer)} s`)
    console.log(`  first bar of the calendar itself (draggable): median ${(medCalendar / 1000).toFixed(2)} s of ${secs(firstCalendarBar)} s`)
    record({ name: 'first pour bar drawn, 4× CPU slowdown (median of 3)', value: `${(med / 1000).toFixed(2)} s`, target: '≤ 1.5 s', met: med <= 1500, note: `runs ${secs(firstBar)} s (the page's first byte at ${secs(pageAnswer)} s); the server's first screen of the board (BoardSketch)` })
    record({ name: 'first bar of the calendar (draggable), 4× CPU slowdown (median of 3)', value: `${(medCalendar / 1000).toFixed(2)} s`, note: `runs ${secs(firstCalendarBar)} s; drawn under the first screen, which it then replaces` })

    // the live patch: a second board open on the week, one pour moved by PATCH
    const k = knex({ client: 'pg', connection: url, pool: { min: 1, max: 1 } })
    const pour = await k('pours').where({ workshop_id: workshopId }).whereRaw('lower(slot) = ?::timestamptz', [`${FROM}T11:30:00Z`]).orderBy('id').first('id', 'version')
    await k.destroy()
    const page = await browser.context.newPage()
    await page.goto(`${base}/lead/board?view=week&date=${FROM}`)
    const bar = page.locator(`[data-testid="pour-bar"][data-pour-id="${pour.id}"]`)
    await bar.waitFor()
    await page.locator('[data-testid="live-status"][data-status="online"]').waitFor({ timeout: 10_000 })
    await page.evaluate((id) => {
      const harness = document.querySelector(`[data-pour-id="${id}"]`)!.closest('.fc-timeline-event-harness') as HTMLElement
      const start = harness.style.left
      const w = window as unknown as { movedAt?: number }
      new MutationObserver(() => {
        const now = document.querySelector(`[data-pour-id="${id}"]`)?.closest('.fc-timeline-event-harness') as HTMLElement | null
        if (now && now.style.left !== start && !w.movedAt) w.movedAt = performance.timeOrigin + performance.now()
      }).observe(document.querySelector('.setline-board')!, { subtree: true, attributes: true, childList: true })
    }, pour.id)
    const sentAt = performance.timeOrigin + performance.now()
    const r = await fetch(`${base}/api/pours/${pour.id}`, {
      method: 'PATCH', headers: { 'cookie': cookie, 'origin': base, 'content-type': 'application/json' },
      body: JSON.stringify({ version: pour.version, slotStart: `${FROM}T13:30:00Z` }),
    })
    if (!r.ok) throw new Error(`the PATCH answered ${r.status}: ${await r.text()}`)
    await page.waitForFunction(() => !!(window as unknown as { movedAt?: number }).movedAt, undefined, { timeout: 10_000 })
    const movedAt = await page.evaluate(() => (window as unknown as { movedAt: number }).movedAt)
    const patch = movedAt - sentAt
    console.log(`  live pour change reaching another open board: ${patch.toFixed(0)} ms from PATCH sent to the bar moved (patched in place)`)
    record({ name: 'live pour change → bar moved on another board', value: `${patch.toFixed(0)} ms`, note: 'from the PATCH being sent; includes the request, commit and socket event' })
    await page.close()
  }
  finally {
    await browser.close()
  }
}

main().catch((err) => {
  console.error(err)
  process.exit(1)
})
