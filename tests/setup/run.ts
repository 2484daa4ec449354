// npm test: one throwaway PostgreSQL for the run, then lint, typecheck, unit, component,
// services (no build), build, API and browser tests; prints one summary line at the end.
// On 2 cores the full run keeps two lanes busy, since most steps leave a core idle:
//   lane 1: typecheck → build (into .nuxt-build, so prepare's .nuxt is not rewritten under
//           vue-tsc) → API tests (files side by side, vitest.config.ts)
//   lane 2: lint → unit → component (its own .nuxt-vitest) → services → browser tests (after the build)
// Each step's output goes to test-output/<step>.log and is printed whole when the step ends,
// so two lanes never interleave their lines.
import { spawn, spawnSync } from 'node:child_process'
import { createWriteStream, existsSync, mkdirSync, readFileSync, readdirSync, rmSync } from 'node:fs'
import { join } from 'node:path'
import { root } from '../../db/local/config'
import { seedIfEmpty } from '../../db/local/cluster'
import { startThrowawayDb } from './throwaway-db'

// Every password and PIN hash of the run (the seed, the fixtures, each test server) at scrypt
// cost 2^14 instead of 2^17: hundreds of sign-ins at 128 MiB each would otherwise take most of
// the run's time, and no test is about the cost itself (server/utils/password-policy.ts).
process.env.NUXT_HASH_SCRYPT_COST ??= String(2 ** 14)

interface StepResult { name: string; ok: boolean; seconds: number; passed: number; failed: number; skipped: number }
const results: StepResult[] = []
const running = new Set<ReturnType<typeof spawn>>()
const outDir = join(root, 'test-output')
const buildDir = join(root, '.nuxt-build')

function ensureChromium() {
  if (existsSync('/usr/bin/chromium')) return
  if (process.getuid?.() !== 0) throw new Error('Debian chromium is missing: sudo apt-get install -y chromium')
  console.log('setline test: installing Debian chromium (apt-get)…')
  const env = { ...process.env, DEBIAN_FRONTEND: 'noninteractive' }
  for (const args of [['update', '-qq'], ['install', '-y', '-qq', 'chromium']]) {
    if (spawnSync('apt-get', args, { stdio: 'inherit', env }).status !== 0) throw new Error(`apt-get ${args.join(' ')} failed`)
  }
}

function counts(res: StepResult, status: number | null, countsFile?: string) {
  if (countsFile && existsSync(countsFile)) {
    const j = JSON.parse(readFileSync(countsFile, 'utf8'))
    res.passed = j.numPassedTests ?? 0
    res.failed = (j.numFailedTests ?? 0) + (status !== 0 && !j.numFailedTests ? 1 : 0)
    res.skipped = (j.numPendingTests ?? 0) + (j.numTodoTests ?? 0)
  }
  else if (countsFile) {
    res.failed = 1
  }
  results.push(res)
  return res.ok
}

const stepEnv = (env: Record<string, string>) => ({ ...process.env, NUXT_TELEMETRY_DISABLED: '1', ...env })

/** A step in the foreground, its output straight to the terminal (a selection of files). */
function step(name: string, cmd: string, args: string[], env: Record<string, string> = {}, countsFile?: string) {
  console.log(`\n── ${name} ──`)
  const t = Date.now()
  const r = spawnSync(cmd, args, { cwd: root, stdio: 'inherit', env: stepEnv(env) })
  return counts({ name, ok: r.status === 0, seconds: (Date.now() - t) / 1000, passed: 0, failed: 0, skipped: 0 }, r.status, countsFile)
}

/** A step beside another: its output goes to test-output/<name>.log, printed whole when it ends. */
function laneStep(name: string, cmd: string, args: string[], env: Record<string, string> = {}, countsFile?: string) {
  const t = Date.now()
  const logFile = join(outDir, `${name.replace(/\W+/g, '-')}.log`)
  const log = createWriteStream(logFile)
  // a group of its own, so a stop ends vitest, its workers and their app servers, not only npx
  const proc = spawn(cmd, args, { cwd: root, stdio: ['ignore', 'pipe', 'pipe'], env: stepEnv(env), detached: true })
  running.add(proc)
  proc.stdout.pipe(log, { end: false })
  proc.stderr.pipe(log, { end: false })
  return new Promise<boolean>((resolve) => {
    proc.on('close', (status) => {
      running.delete(proc)
      log.end(() => {
        const seconds = (Date.now() - t) / 1000
        console.log(`\n── ${name} (${seconds.toFixed(1)} s, test-output/${logFile.split('/').pop()}) ──`)
        process.stdout.write(readFileSync(logFile))
        resolve(counts({ name, ok: status === 0, seconds, passed: 0, failed: 0, skipped: 0 }, status, countsFile))
      })
    })
  })
}

function vitestArgs(project: string, files: string[]) {
  const file = join(outDir, `vitest-${project}.json`)
  return { file, args: ['vitest', 'run', '--project', project, '--reporter=default', '--reporter=json', `--outputFile.json=${file}`, ...files] }
}

function vitest(project: string, env: Record<string, string>, files: string[] = []) {
  const { file, args } = vitestArgs(project, files)
  return step(`${project} tests`, 'npx', args, env, file)
}

function laneVitest(project: string, env: Record<string, string>) {
  const { file, args } = vitestArgs(project, [])
  return laneStep(`${project} tests`, 'npx', args, env, file)
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
  // Ctrl-C or a stopped CI job: end the steps and the cluster rather than leave them running
  for (const signal of ['SIGINT', 'SIGTERM'] as const) {
    process.once(signal, () => {
      for (const p of running) if (p.pid) process.kill(-p.pid, 'SIGTERM')
      db.stop()
      process.exit(130)
    })
  }
  let exitCode = 1
  try {
    await seedIfEmpty(db.url)
    const env = { SETLINE_TEST_DATABASE_URL: db.url }
    const only = selection(process.argv.slice(2))
    if (only.files.length) {
      for (const p of ['unit', 'component', 'services']) if (only.byProject.has(p)) vitest(p, env, only.byProject.get(p))
      const needsServer = only.byProject.has('api') || only.byProject.has('e2e')
      const built = !needsServer || !only.build || step('build', 'npx', ['nuxt', 'build'], { NODE_ENV: 'production', SETLINE_BUILD_DIR: buildDir })
      if (built) for (const p of ['api', 'e2e']) if (only.byProject.has(p)) vitest(p, env, only.byProject.get(p))
    }
    else {
      await runAll(env)
    }
    exitCode = results.every(r => r.ok) ? 0 : 1
  }
  finally {
    db.stop()
  }
  summary(t0, exitCode)
}

async function runAll(env: Record<string, string>) {
  let buildDone!: (ok: boolean) => void
  const built = new Promise<boolean>(r => buildDone = r)
  const lane1 = (async () => {
    await laneStep('typecheck', 'npx', ['nuxt', 'typecheck'])
    const ok = await laneStep('build', 'npx', ['nuxt', 'build'], { NODE_ENV: 'production', SETLINE_BUILD_DIR: buildDir })
    buildDone(ok)
    if (ok) await laneVitest('api', env)
  })()
  const lane2 = (async () => {
    await laneStep('lint', 'npx', ['eslint', '.'])
    await laneVitest('unit', env)
    await laneVitest('component', env)
    await laneVitest('services', env)
    if (await built) await laneVitest('e2e', env)
  })()
  await Promise.all([lane1, lane2])
}

/** The slowest test files of the run, from vitest's JSON reports: where a faster run starts looking. */
function slowestFiles(n = 10) {
  const files: { name: string; seconds: number }[] = []
  for (const f of existsSync(outDir) ? readdirSync(outDir) : []) {
    if (!/^vitest-.*\.json$/.test(f)) continue
    const j = JSON.parse(readFileSync(join(outDir, f), 'utf8'))
    for (const r of j.testResults ?? []) files.push({ name: String(r.name).replace(`${root}/`, ''), seconds: (r.endTime - r.startTime) / 1000 })
  }
  if (!files.length) return
  console.log('\nSlowest test files (from their first test to their last; files of a project run side by side):')
  for (const f of files.sort((a, b) => b.seconds - a.seconds).slice(0, n)) console.log(`  ${f.seconds.toFixed(1).padStart(6)} s  ${f.name}`)
}

/** The failed tests by file and name, from vitest's JSON reports: CI shows only the tail of a run. */
function listFailedTests() {
  const failed: string[] = []
  for (const f of existsSync(outDir) ? readdirSync(outDir) : []) {
    if (!/^vitest-.*\.json$/.test(f)) continue
    const j = JSON.parse(readFileSync(join(outDir, f), 'utf8'))
    for (const r of j.testResults ?? []) {
      const file = String(r.name).replace(`${root}/`, '')
      const tests = (r.assertionResults ?? []).filter((a: { status: string }) => a.status === 'failed')
      for (const a of tests) failed.push(`  ${file} › ${a.fullName ?? a.title}\n      ${String(a.failureMessages?.[0] ?? '').split('\n')[0]?.slice(0, 300)}`)
      if (!tests.length && r.status === 'failed') failed.push(`  ${file} (the file failed outside a test)\n      ${String(r.message ?? '').split('\n')[0]?.slice(0, 300)}`)
    }
  }
  if (!failed.length) return
  console.log(`\nFailed tests (${failed.length}):`)
  for (const line of failed) console.log(line)
}

function summary(t0: number, exitCode: number) {
  listScreenshots()
  slowestFiles()
  listFailedTests()
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
