// npm run soak: a compressed working week of an invented shop with faults on a seeded schedule
// (tests/soak/sim.ts), against the built app (.output) on a PostgreSQL of its own. Prints the
// figures and the invariants as a table and writes them to test-output/soak.md and to
// tests/soak/soak-results.md, the table the README links (it names the days, seed and load).
// Exits non-zero when an invariant did not hold.
//   npm run soak                      a week (5 days), a fresh seed (printed)
//   npm run soak -- --seed 42         replays the week of seed 42 (SOAK_SEED=42 too)
//   npm run soak -- --days 1          one day (about a minute)
import { existsSync, mkdirSync, writeFileSync } from 'node:fs'
import { cpus, loadavg } from 'node:os'
import { join } from 'node:path'
import { root } from '../../db/local/config'
import { buildIsStale } from '../../db/local/build'
import { runSoak, type SoakReport } from './sim'
import { soakSeed } from './prng'

// the seed's and the soak's people hash at the test run's cost (tests/setup/run.ts says why)
process.env.NUXT_HASH_SCRYPT_COST ??= String(2 ** 14)

function arg(name: string) {
  const i = process.argv.indexOf(`--${name}`)
  return i > 0 ? process.argv[i + 1] : undefined
}

const mb = (kb: number) => `${(kb / 1024).toFixed(0)} MB`

export function figuresTable(r: SoakReport) {
  const faults = Object.entries(r.faults).map(([k, n]) => `${k} ${n}`).join(', ')
  const rows: [string, string][] = [
    ['seed', String(r.seed)],
    ['simulated days', String(r.days)],
    ['wall time', `${r.seconds.toFixed(0)} s`],
    ['actions per simulated day', r.actionsPerDay.join(', ')],
    ['faults injected', faults],
    ['actions queued offline', String(r.queuedOffline)],
    ['actions replayed (answer lost, sent again)', String(r.replayed)],
    ['actions retried after 503 or no answer', String(r.retried)],
    ['refusals kept (409/422)', String(r.refusals)],
    ['longest an action waited', `${(r.longestWaitMs / 1000).toFixed(1)} s`],
    ['p95 of tablet actions', `${r.p95ActionMs.toFixed(0)} ms`],
    ['photos at demould (stored, sent again after no answer, pours with two)', `${r.photos.uploaded}, ${r.photos.retried}, ${r.photos.poursWithMore}`],
    ['mails delivered', String(r.mailsSent)],
    ['responses by status', Object.entries(r.statuses).map(([k, n]) => `${k}: ${n}`).join(', ')],
    ['server memory after warm-up → end (instance B)', `${mb(r.memory.warmKb)} → ${mb(r.memory.endKb)}`],
    ['server peak memory (either instance)', mb(r.memory.peakKb)],
    ['invariants held', `${r.invariants.filter(i => i.held).length} of ${r.invariants.length}`],
  ]
  return rows
}

function markdown(r: SoakReport, at: Date, load: number) {
  const c = cpus()
  return [
    '# Soak figures',
    '',
    `Written by \`npm run soak\` (tests/soak/run.ts) on ${at.toISOString().slice(0, 10)}: ${c.length} cores (${c[0]?.model.trim() ?? 'unknown'}), Node ${process.version}, load average ${load.toFixed(2)} at the start. Replay with \`npm run soak -- --seed ${r.seed} --days ${r.days}\`.`,
    '',
    '| figure | measured |',
    '|---|---|',
    ...figuresTable(r).map(([k, v]) => `| ${k} | ${v} |`),
    '',
    '| invariant | held? | beside it |',
    '|---|---|---|',
    ...r.invariants.map(i => `| ${i.name} | ${i.held ? 'yes' : '**no**'} | ${i.detail.replace(/\|/g, '/')} |`),
    '',
  ].join('\n')
}

async function main() {
  if (!existsSync(join(root, '.output/server/index.mjs'))) throw new Error('no build in .output: run `npx nuxt build` first')
  if (buildIsStale()) console.warn('soak: WARNING the build in .output is older than the sources (run `npx nuxt build`)')
  const seed = soakSeed(arg('seed') ?? process.env.SOAK_SEED)
  const days = Number(arg('days') ?? 5)
  const load = loadavg()[0]!
  const at = new Date()
  console.log(`soak: seed ${seed} (replay: npm run soak -- --seed ${seed} --days ${days}); load average ${load.toFixed(2)}`)
  const report = await runSoak({
    seed, days, casters: Number(arg('casters') ?? 8), finishers: Number(arg('finishers') ?? 3), piecesPerDay: Number(arg('pieces') ?? 40),
    maxMinutes: Number(arg('minutes') ?? 20), log: line => console.log(line),
  })
  const rows = figuresTable(report)
  const w = Math.max(...rows.map(([k]) => k.length))
  console.log('\n== figures')
  for (const [k, v] of rows) console.log(`${k.padEnd(w)}  ${v}`)
  console.log('\n== invariants')
  for (const i of report.invariants) console.log(`${i.held ? 'held' : 'FAIL'}  ${i.name}: ${i.detail}`)
  const md = markdown(report, at, load)
  mkdirSync(join(root, 'test-output'), { recursive: true })
  writeFileSync(join(root, 'test-output/soak.md'), md)
  console.log('\nwritten: test-output/soak.md')
  writeFileSync(join(root, 'tests/soak/soak-results.md'), md)
  console.log('written: tests/soak/soak-results.md (the table the README links)')
  process.exitCode = report.invariants.every(i => i.held) ? 0 : 1
}

main().catch((err) => {
  console.error(err)
  process.exit(1)
})
