/**
 * Lighthouse on each role's main pages (plain tsx script; `npm run bench -- lighthouse` runs it
 * alone through run.ts). Lighthouse 12.2.3 (the Chrome team's page auditor, the last line that
 * runs on Node 20) drives Debian's chromium, started headless by chrome-launcher, against the
 * built server the bench starts. Each page is audited with Lighthouse's two stock profiles:
 *  - mobile: its default (a mid-range phone, simulated slow 4G at 150 ms RTT and 1.6 Mbit/s,
 *    4× CPU slowdown; Lighthouse docs, "throttling");
 *  - desktop: its desktop-config (40 ms RTT, 10 Mbit/s, no CPU slowdown).
 * The throttling is simulated (Lantern), so the timings are modelled from the trace and network
 * log rather than waited out; TBT still follows the real CPU, so a busy machine raises it.
 * Signed-in pages get the role's session cookie as an extra request header.
 *
 * Three runs per page and profile; every figure printed is the median of its three values.
 * "bytes" is Lighthouse's total-byte-weight: what came over the wire (transfer size, so a
 * compressed answer counts compressed). Targets from the issue (mobile): performance ≥ 90
 * (the board ≥ 75 mobile, ≥ 95 desktop), LCP ≤ 2.5 s, TBT ≤ 200 ms, CLS ≤ 0.1, accessibility
 * 100, best practices 100, bytes at most half of the issue's measured figure for the page.
 *
 * Figures go to run.ts like every bench's, and the table is also written (after every row) to
 * tests/bench/lighthouse-results.md under the label in LIGHTHOUSE_LABEL (default "latest"),
 * keeping other labels' sections there, so a "before" table stays beside the "after" one.
 * LIGHTHOUSE_RUNS (default 3) and LIGHTHOUSE_PAGES (comma-separated paths) narrow a run;
 * LIGHTHOUSE_REPORTS names a folder that gets each run's whole report (JSON).
 * Prints figures; never asserts.
 */
import { existsSync, mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs'
import { cpus, loadavg, tmpdir } from 'node:os'
import { dirname, join } from 'node:path'
import { fileURLToPath } from 'node:url'
import * as chromeLauncher from 'chrome-launcher'
import lighthouse, { desktopConfig } from 'lighthouse'
import { benchDatabase, DEMO_PASSWORD, DEMO_USERS, signIn, startBenchServer } from './lib/app'
import { record } from './lib/results'

const here = dirname(fileURLToPath(import.meta.url))
const RESULTS = join(here, 'lighthouse-results.md')
const RUNS = Number(process.env.LIGHTHOUSE_RUNS ?? 3)
const LABEL = process.env.LIGHTHOUSE_LABEL ?? 'latest'

/** The issue's measured bytes per page on the mobile profile (KB); the target is half. */
const ISSUE_KB: Record<string, number> = { '/login': 483, '/lead/board': 895, '/floor': 598, '/client/jobs/[id]': 522 }

type Profile = 'mobile' | 'desktop'
interface Visit { path: string; name: string; role: string; cookie?: string }
interface Run { score: number; fcp: number; lcp: number; tbt: number; cls: number; a11y: number; bp: number; bytes: number; failing: string[] }

const email = (key: string) => DEMO_USERS.find(u => u.key === key)!.email

function median(values: number[]) {
  const s = [...values].sort((a, b) => a - b)
  return s.length % 2 ? s[(s.length - 1) / 2]! : (s[s.length / 2 - 1]! + s[s.length / 2]!) / 2
}

async function audit(port: number, url: string, profile: Profile, cookie: string | undefined): Promise<Run> {
  const result = await lighthouse(url, {
    port,
    output: 'json',
    logLevel: 'error',
    onlyCategories: ['performance', 'accessibility', 'best-practices'],
    extraHeaders: cookie ? { Cookie: cookie } : undefined,
  }, profile === 'desktop' ? desktopConfig : undefined)
  if (!result) throw new Error(`no Lighthouse result for ${url}`)
  const lhr = result.lhr
  if (lhr.runtimeError) throw new Error(`${url}: ${lhr.runtimeError.code} ${lhr.runtimeError.message}`)
  // the whole report, to see where a page's time went (LIGHTHOUSE_REPORTS=folder)
  if (process.env.LIGHTHOUSE_REPORTS) {
    const name = `${new URL(url).pathname.replace(/\W+/g, '_')}-${profile}-${Date.now()}.json`
    mkdirSync(process.env.LIGHTHOUSE_REPORTS, { recursive: true })
    writeFileSync(join(process.env.LIGHTHOUSE_REPORTS, name), JSON.stringify(lhr))
  }
  const landed = new URL(lhr.finalDisplayedUrl).pathname
  if (landed !== new URL(url).pathname) throw new Error(`${url} landed on ${landed}`)
  const n = (id: string) => lhr.audits[id]?.numericValue ?? NaN
  const pct = (id: string) => Math.round((lhr.categories[id]?.score ?? NaN) * 100)
  // the audits that cost points in accessibility and best practices, to write beside a miss
  const failing = ['accessibility', 'best-practices'].flatMap(c => (lhr.categories[c]?.auditRefs ?? [])
    .filter(r => r.weight > 0 && (lhr.audits[r.id]?.score ?? 1) < 1).map(r => r.id))
  return {
    score: pct('performance'), fcp: n('first-contentful-paint'), lcp: n('largest-contentful-paint'),
    tbt: n('total-blocking-time'), cls: n('cumulative-layout-shift'), a11y: pct('accessibility'),
    bp: pct('best-practices'), bytes: n('total-byte-weight'), failing,
  }
}

interface Row { visit: Visit; profile: Profile; m: Omit<Run, 'failing'>; failing: string[]; met: boolean; misses: string[]; target: string }

function judge(visit: Visit, profile: Profile, m: Row['m']) {
  const misses: string[] = []
  const board = visit.path === '/lead/board'
  const minScore = profile === 'desktop' ? (board ? 95 : 90) : (board ? 75 : 90)
  if (m.score < minScore) misses.push(`score < ${minScore}`)
  if (profile === 'mobile') {
    if (m.lcp > 2500) misses.push('LCP > 2.5 s')
    if (m.tbt > 200) misses.push('TBT > 200 ms')
  }
  if (m.cls > 0.1) misses.push('CLS > 0.1')
  if (m.a11y < 100) misses.push('accessibility < 100')
  if (m.bp < 100) misses.push('best practices < 100')
  const issueKb = profile === 'mobile' ? ISSUE_KB[visit.name] : undefined
  if (issueKb && m.bytes / 1024 > issueKb / 2) misses.push(`bytes > ${issueKb / 2} KB`)
  const target = profile === 'mobile'
    ? `score ≥ ${minScore}, LCP ≤ 2.5 s, TBT ≤ 200 ms, CLS ≤ 0.1, a11y 100, BP 100${issueKb ? `, ≤ ${issueKb / 2} KB` : ''}`
    : `score ≥ ${minScore}, CLS ≤ 0.1, a11y 100, BP 100`
  return { misses, met: !misses.length, target }
}

const s = (ms: number) => `${(ms / 1000).toFixed(1)} s`
const kb = (b: number) => `${Math.round(b / 1024)} KB`

function markdown(rows: Row[], at: Date, loadStart: number, loadEnd: number) {
  const c = cpus()
  const lines = rows.map(r => `| ${r.visit.name} | ${r.profile} | ${r.m.score} | ${s(r.m.fcp)} | ${s(r.m.lcp)} | ${Math.round(r.m.tbt)} ms | ${r.m.cls.toFixed(3)} | ${r.m.a11y} | ${r.m.bp} | ${kb(r.m.bytes)} | ${r.met ? 'yes' : `**no**: ${r.misses.join(', ')}`}${r.failing.length ? ` (audits below 1: ${r.failing.join(', ')})` : ''} |`)
  return [
    `## ${LABEL}`,
    '',
    `Measured ${at.toISOString().slice(0, 16).replace('T', ' ')} UTC, ${c.length} cores (${c[0]?.model.trim() ?? 'unknown'}), Node ${process.version}, `
    + `Lighthouse 12.2.3, median of ${RUNS} run(s) per row; load average ${loadStart.toFixed(2)} at the start and ${loadEnd.toFixed(2)} at the end (the machine is shared).`,
    '',
    '| page | profile | score | FCP | LCP | TBT | CLS | a11y | best pr. | bytes | targets met? |',
    '|---|---|---|---|---|---|---|---|---|---|---|',
    ...lines,
    '',
  ].join('\n')
}

/** Replaces this label's section of lighthouse-results.md and keeps the others. */
function writeSection(section: string) {
  const head = '# Lighthouse figures\n\nWritten by `npm run bench -- lighthouse` (tests/bench/lighthouse.ts); one section per `LIGHTHOUSE_LABEL`. Reasons for misses are written under the table they belong to.\n'
  const old = existsSync(RESULTS) ? readFileSync(RESULTS, 'utf8') : head
  const parts = old.split(/^(?=## )/m)
  const kept = parts.slice(1).filter(p => !p.startsWith(`## ${LABEL}\n`))
  writeFileSync(RESULTS, [parts[0]!.trimEnd() + '\n\n', section + '\n', ...kept].join(''))
}

async function main() {
  const started = new Date()
  const loadStart = loadavg()[0]!
  const db = await benchDatabase()
  const app = await startBenchServer(db.url)
  const profileDir = mkdtempSync(join(tmpdir(), 'setline-lighthouse-'))
  const chrome = await chromeLauncher.launch({
    chromePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium',
    userDataDir: profileDir,
    chromeFlags: ['--headless=new', '--no-sandbox', '--disable-gpu', '--disable-dev-shm-usage', '--disable-quic',
      '--disable-component-update', '--disable-sync'],
  })
  try {
    const cookies: Record<string, string> = {}
    for (const key of ['lead', 'caster1', 'finisher', 'client1']) cookies[key] = await signIn(app.url, email(key), DEMO_PASSWORD)
    const jobs = await fetch(`${app.url}/api/client/jobs`, { headers: { cookie: cookies.client1! } }).then(r => r.json()) as { id: number }[]
    const jobId = jobs[0]?.id
    if (!jobId) throw new Error('the demo client has no job')
    let visits: Visit[] = [
      { path: '/login', name: '/login', role: 'signed out' },
      { path: '/lead', name: '/lead (Today)', role: 'lead', cookie: cookies.lead },
      { path: '/lead/board', name: '/lead/board', role: 'lead', cookie: cookies.lead },
      { path: '/floor', name: '/floor', role: 'caster', cookie: cookies.caster1 },
      { path: '/finishing', name: '/finishing', role: 'finisher', cookie: cookies.finisher },
      { path: '/mix', name: '/mix', role: 'caster', cookie: cookies.caster1 },
      { path: `/client/jobs/${jobId}`, name: '/client/jobs/[id]', role: 'client', cookie: cookies.client1 },
    ]
    const only = process.env.LIGHTHOUSE_PAGES?.split(',').filter(Boolean)
    if (only?.length) visits = visits.filter(v => only.some(o => v.name.startsWith(o)))
    const rows: Row[] = []
    console.log(`Lighthouse 12.2.3, median of ${RUNS} run(s); load average ${loadStart.toFixed(2)}`)
    console.log(`  ${'page'.padEnd(18)} ${'profile'.padEnd(8)} score   FCP    LCP    TBT    CLS  a11y  BP   bytes   met?`)
    for (const visit of visits) {
      for (const profile of ['mobile', 'desktop'] as const) {
        const runs: Run[] = []
        for (let i = 0; i < RUNS; i++) runs.push(await audit(chrome.port, app.url + visit.path, profile, visit.cookie))
        const pick = (k: keyof Omit<Run, 'failing'>) => median(runs.map(r => r[k]))
        const m = { score: pick('score'), fcp: pick('fcp'), lcp: pick('lcp'), tbt: pick('tbt'), cls: pick('cls'), a11y: pick('a11y'), bp: pick('bp'), bytes: pick('bytes') }
        const failing = [...new Set(runs.flatMap(r => r.failing))]
        const { misses, met, target } = judge(visit, profile, m)
        rows.push({ visit, profile, m, failing, met, misses, target })
        console.log(`  ${visit.name.padEnd(18)} ${profile.padEnd(8)} ${String(m.score).padStart(5)} ${s(m.fcp).padStart(6)} ${s(m.lcp).padStart(6)} ${`${Math.round(m.tbt)} ms`.padStart(7)} ${m.cls.toFixed(3).padStart(6)} ${String(m.a11y).padStart(4)} ${String(m.bp).padStart(4)} ${kb(m.bytes).padStart(7)}  ${met ? 'yes' : `no: ${misses.join(', ')}`}${failing.length ? ` [${failing.join(', ')}]` : ''}`)
        record({
          name: `Lighthouse ${profile}, ${visit.name} (${visit.role})`,
          value: `${m.score}; FCP ${s(m.fcp)}, LCP ${s(m.lcp)}, TBT ${Math.round(m.tbt)} ms, CLS ${m.cls.toFixed(3)}, a11y ${m.a11y}, BP ${m.bp}, ${kb(m.bytes)}`,
          target,
          met,
          note: misses.length ? `missed: ${misses.join(', ')}` : undefined,
        })
        // after every row, so a run cut short still leaves the rows it measured
        writeSection(markdown(rows, started, loadStart, loadavg()[0]!))
      }
    }
    console.log('written: tests/bench/lighthouse-results.md')
  }
  finally {
    await chrome.kill()
    rmSync(profileDir, { recursive: true, force: true })
    await app.stop()
    db.stop()
  }
}

main().catch((err) => {
  console.error(err)
  process.exit(1)
})
