/**
 * Runs every benchmark script in tests/bench (each a plain tsx script that prints its figures),
 * one after another so they do not compete for the machine's cores, against one throwaway
 * PostgreSQL with the demo workshop (BENCH_DATABASE_URL). Each script reports its headline
 * figures through lib/results.ts; at the end they are printed as one table (figure, target, met?)
 * and written with the date and the machine to test-output/bench.json and test-output/bench.md;
 * a run of every script also rewrites tests/bench/results.md, the table the README links. Exits non-zero only when a script crashes; timings are never asserted.
 * `npm run bench -- readers realtime` runs only the scripts whose names contain those words.
 */
import { spawnSync } from 'node:child_process'
import { existsSync, mkdirSync, mkdtempSync, readFileSync, readdirSync, rmSync, writeFileSync } from 'node:fs'
import { cpus, loadavg, tmpdir, totalmem } from 'node:os'
import { fileURLToPath } from 'node:url'
import { dirname, join } from 'node:path'
import { startThrowawayDb } from '../setup/throwaway-db'
import { seedIfEmpty } from '../../db/local/cluster'
import { buildIsStale } from '../../db/local/build'
import { root } from '../../db/local/config'
import type { Figure } from './lib/results'

const here = dirname(fileURLToPath(import.meta.url))
const only = process.argv.slice(2)
const scripts = readdirSync(here).filter(f => f.endsWith('.ts') && f !== 'run.ts')
  .filter(f => !only.length || only.some(o => f.includes(o))).sort()

function machine() {
  const c = cpus()
  return {
    cores: c.length,
    cpu: c[0]?.model.trim() ?? 'unknown',
    memoryGb: Math.round(totalmem() / 1024 ** 3),
    node: process.version,
    loadAverage1m: Number(loadavg()[0]!.toFixed(2)),
  }
}

function table(figures: Figure[]) {
  const rows = figures.map(f => [f.name, f.value, f.target ?? '', f.met === undefined ? '' : f.met ? 'yes' : 'NO'])
  const head = ['figure', 'measured', 'target', 'met?']
  const widths = head.map((h, i) => Math.max(h.length, ...rows.map(r => r[i]!.length)))
  const line = (r: string[]) => r.map((c, i) => c.padEnd(widths[i]!)).join('  ')
  return [line(head), line(widths.map(w => '-'.repeat(w))), ...rows.map(line)].join('\n')
}

function markdown(figures: Figure[], at: Date, m: ReturnType<typeof machine>, loadAfter: number) {
  const rows = figures.map(f => `| ${f.name} | ${f.value} | ${f.target ?? ''} | ${f.met === undefined ? '' : f.met ? 'yes' : '**no**'} | ${f.note ?? ''} |`)
  return [
    `Measured ${at.toISOString().slice(0, 10)} on ${m.cores} cores (${m.cpu}), ${m.memoryGb} GB, Node ${m.node}; `
    + `load average ${m.loadAverage1m} at the start and ${loadAfter.toFixed(2)} at the end.`,
    '',
    '| figure | measured | target | met? | beside it |',
    '|---|---|---|---|---|',
    ...rows,
    '',
  ].join('\n')
}

async function main() {
  if (!existsSync(join(root, '.output/server/index.mjs'))) throw new Error('no build in .output: run `npx nuxt build` first')
  if (buildIsStale()) console.warn('bench: WARNING the build in .output is older than the sources; figures are for the old build (run `npx nuxt build`)')
  const started = new Date()
  const m = machine()
  const resultsDir = mkdtempSync(join(tmpdir(), 'setline-bench-'))
  const resultsFile = join(resultsDir, 'figures.jsonl')
  writeFileSync(resultsFile, '')
  console.log('bench: starting a throwaway PostgreSQL…')
  const db = await startThrowawayDb()
  let failed = 0
  try {
    await seedIfEmpty(db.url)
    for (const script of scripts) {
      console.log(`\n== ${script}`)
      const run = spawnSync(process.execPath, ['--import', 'tsx', join(here, script)], {
        stdio: 'inherit', env: { ...process.env, BENCH_DATABASE_URL: db.url, BENCH_RESULTS: resultsFile },
      })
      if (run.status !== 0) {
        failed++
        console.error(`${script} exited with ${run.status ?? run.signal}`)
      }
    }
  }
  finally {
    db.stop()
  }
  const figures = readFileSync(resultsFile, 'utf8').split('\n').filter(Boolean).map(l => JSON.parse(l) as Figure)
  rmSync(resultsDir, { recursive: true, force: true })
  const loadAfter = loadavg()[0]!
  console.log(`\n== summary (${started.toISOString().slice(0, 10)}, ${m.cores} cores, Node ${m.node}, load ${m.loadAverage1m} → ${loadAfter.toFixed(2)})\n`)
  console.log(table(figures))
  const out = join(root, 'test-output')
  mkdirSync(out, { recursive: true })
  writeFileSync(join(out, 'bench.json'), JSON.stringify({ measuredAt: started.toISOString(), machine: { ...m, loadAverage1mAfter: loadAfter }, figures }, null, 2) + '\n')
  writeFileSync(join(out, 'bench.md'), markdown(figures, started, m, loadAfter))
  console.log('\nwritten: test-output/bench.json, test-output/bench.md')
  if (!only.length && !failed) {
    writeFileSync(join(here, 'results.md'), `# Benchmark figures\n\nWritten by \`npm run bench\` (every script; tests/bench/run.ts). ${markdown(figures, started, m, loadAfter)}`)
    console.log('written: tests/bench/results.md (the table the README links)')
  }
  process.exitCode = failed ? 1 : 0
}

main().catch((err) => {
  console.error(err)
  process.exit(1)
})
