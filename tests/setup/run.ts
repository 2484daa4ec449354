// npm test: one throwaway PostgreSQL and SMTP fake for the run, then lint, typecheck, unit,
// component, services (no build), build, API and browser tests; prints one summary line at the end.
import { spawnSync } from 'node:child_process'
import { existsSync, mkdirSync, readFileSync, readdirSync, rmSync } from 'node:fs'
import { join } from 'node:path'
import { root } from '../../db/local/config'
import { seedIfEmpty } from '../../db/local/cluster'
import { startThrowawayDb } from './throwaway-db'

interface StepResult { name: string; ok: boolean; seconds: number; passed: number; failed: number; skipped: number }
const results: StepResult[] = []
const outDir = join(root, 'test-output')

function ensureChromium() {
  if (existsSync('/usr/bin/chromium')) return
  if (process.getuid?.() !== 0) throw new Error('Debian chromium is missing: sudo apt-get install -y chromium')
  console.log('setline test: installing Debian chromium (apt-get)…')
  const env = { ...process.env, DEBIAN_FRONTEND: 'noninteractive' }
  for (const args of [['update', '-qq'], ['install', '-y', '-qq', 'chromium']]) {
    if (spawnSync('apt-get', args, { stdio: 'inherit', env }).status !== 0) throw new Error(`apt-get ${args.join(' ')} failed`)
  }
}

function step(name: string, cmd: string, args: string[], env: Record<string, string> = {}, countsFile?: string) {
  console.log(`\n── ${name} ──`)
  const t = Date.now()
  const r = spawnSync(cmd, args, { cwd: root, stdio: 'inherit', env: { ...process.env, NUXT_TELEMETRY_DISABLED: '1', ...env } })
  const res: StepResult = { name, ok: r.status === 0, seconds: (Date.now() - t) / 1000, passed: 0, failed: 0, skipped: 0 }
  if (countsFile && existsSync(countsFile)) {
    const j = JSON.parse(readFileSync(countsFile, 'utf8'))
    res.passed = j.numPassedTests ?? 0
    res.failed = (j.numFailedTests ?? 0) + (r.status !== 0 && !j.numFailedTests ? 1 : 0)
    res.skipped = (j.numPendingTests ?? 0) + (j.numTodoTests ?? 0)
  }
  else if (countsFile) {
    res.failed = 1
  }
  results.push(res)
  return res.ok
}

function vitest(project: string, env: Record<string, string>, files: string[] = []) {
  const file = join(outDir, `vitest-${project}.json`)
  return step(`${project} tests`, 'npx', ['vitest', 'run', '--project', project, '--reporter=default', '--reporter=json', `--outputFile.json=${file}`, ...files], env, file)
}

/**
 * `npm test -- tests/api/auth.test.ts tests/e2e/tablet.test.ts` runs only those files (with a
 * build first when any of them needs the server; `--no-build` reuses .output); no lint or typecheck.
 */
function selection(argv: string[]) {
  const files = argv.filter(a => !a.startsWith('--'))
  const projectOf = (f: string) => ({ unit: 'unit', nuxt: 'component', services: 'services', api: 'api', e2e: 'e2e' } as Record<string, string>)[f.replace(/^\.\//, '').split('/')[1] ?? ''] ?? ''
  const byProject = new Map<string, string[]>()
  for (const f of files) {
    const p = projectOf(f)
    if (!p) throw new Error(`${f}: not a test file under tests/unit, tests/nuxt, tests/services, tests/api or tests/e2e`)
    byProject.set(p, [...(byProject.get(p) ?? []), f])
  }
  return { files, byProject, build: !argv.includes('--no-build') }
}

function listScreenshots() {
  const dir = join(outDir, 'screenshots')
  if (!existsSync(dir)) return
  const files = readdirSync(dir).filter(f => f.endsWith('.png')).sort()
  if (!files.length) return
  console.log(`\nScreenshots (${files.length}) in test-output/screenshots/:`)
  for (const f of files) console.log(`  ${f}`)
}

async function main() {
  const t0 = Date.now()
  rmSync(outDir, { recursive: true, force: true })
  mkdirSync(outDir, { recursive: true })
  ensureChromium()
  console.log('setline test: starting a throwaway PostgreSQL…')
  const db = await startThrowawayDb()
  let exitCode = 1
  try {
    await seedIfEmpty(db.url)
    const env = { SETLINE_TEST_DATABASE_URL: db.url }
    const only = selection(process.argv.slice(2))
    if (only.files.length) {
      for (const p of ['unit', 'component', 'services']) if (only.byProject.has(p)) vitest(p, env, only.byProject.get(p))
      const needsServer = only.byProject.has('api') || only.byProject.has('e2e')
      const built = !needsServer || !only.build || step('build', 'npx', ['nuxt', 'build'], { NODE_ENV: 'production' })
      if (built) for (const p of ['api', 'e2e']) if (only.byProject.has(p)) vitest(p, env, only.byProject.get(p))
    }
    else {
      runAll(env)
    }
    exitCode = results.every(r => r.ok) ? 0 : 1
  }
  finally {
    db.stop()
  }
  summary(t0, exitCode)
}

function runAll(env: Record<string, string>) {
  step('lint', 'npx', ['eslint', '.'])
  step('typecheck', 'npx', ['nuxt', 'typecheck'])
  vitest('unit', env)
  vitest('component', env)
  vitest('services', env)
  const built = step('build', 'npx', ['nuxt', 'build'], { NODE_ENV: 'production' })
  if (built) {
    vitest('api', env)
    vitest('e2e', env)
  }
}

function summary(t0: number, exitCode: number) {
  listScreenshots()
  console.log('\n── summary ──')
  for (const r of results) {
    const counts = r.passed || r.failed ? ` (${r.passed} passed, ${r.failed} failed${r.skipped ? `, ${r.skipped} skipped` : ''})` : ''
    console.log(`  ${r.ok ? 'ok  ' : 'FAIL'} ${r.name.padEnd(16)} ${r.seconds.toFixed(1).padStart(6)} s${counts}`)
  }
  const passed = results.reduce((n, r) => n + r.passed, 0)
  const failedTests = results.reduce((n, r) => n + r.failed, 0)
  const failedSteps = results.filter(r => !r.ok && !r.failed).length
  console.log(`  total ${((Date.now() - t0) / 1000).toFixed(0)} s`)
  console.log(`tests: ${passed} passed, ${failedTests + failedSteps} failed`)
  process.exit(exitCode)
}

main().catch((err) => {
  console.error(err)
  process.exit(1)
})
