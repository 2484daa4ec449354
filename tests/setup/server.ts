// The built app server (.output) for tests and benchmarks, and the vitest globalSetup of the api,
// e2e and services projects: it hands each test file the run's seeded template database, from
// which tests/setup/services.ts clones the file's own database; for the api and e2e projects it
// also runs the pool of servers started ahead (tests/setup/server-pool.ts), each on a database
// of its own cloned from that template, from which tests/setup/per-file.ts claims the file's server.
import { spawn, type ChildProcess } from 'node:child_process'
import { existsSync } from 'node:fs'
import { resolve } from 'node:path'
import type { TestProject } from 'vitest/node'
import { freePort } from './throwaway-db'
import { startServerPool } from './server-pool'

declare module 'vitest' {
  export interface ProvidedContext { templateUrl: string; serverPoolUrl: string }
}

/**
 * Starts the built app; with `output`, what it prints is also collected there (a test reads its log),
 * and echoed unless `echo` is false (the soak keeps its servers' thousands of lines out of the terminal).
 * SETLINE_BUILD_DIR names another copy of a build to start instead of .output (a benchmark of an
 * older build while the tree is rebuilt). `startLimitMs`: how long it may take to answer GET /api/health.
 */
export async function startAppServer(env: Record<string, string>, output?: string[], echo = true, startLimitMs = 150_000) {
  const root = resolve(import.meta.dirname, '../..')
  const entry = resolve(root, process.env.SETLINE_BUILD_DIR ?? '.output', 'server/index.mjs')
  if (!existsSync(entry)) throw new Error(`No build in ${entry}: run npm test (it builds first)`)
  const [port, smtpPort] = [await freePort(), await freePort()]
  // background work at short intervals (a sweep every 2 s, the overdue check every 3 s), so a
  // test waits seconds for a retry or an overdue mail; shorter, a file's idle servers (the pool
  // keeps some started ahead) spent a core's tenth between them on sweeps that found nothing
  const proc = spawn(process.execPath, [entry], {
    cwd: root,
    env: {
      ...process.env, HOST: '127.0.0.1', PORT: String(port), APP_URL: `http://127.0.0.1:${port}`,
      MAIL_FAKE: '1', SMTP_HOST: '127.0.0.1', SMTP_PORT: String(smtpPort), LOG_LEVEL: 'warn', PAYMENTS_FAKE: '1',
      MAIL_WORKER_INTERVAL_MS: '2000', MAIL_RETRY_BASE_SECONDS: '1', OVERDUE_CHECK_INTERVAL_MS: '3000', ...env,
    },
    stdio: ['ignore', output ? 'pipe' : 'inherit', output ? 'pipe' : 'inherit'],
  })
  if (output) {
    proc.stdout!.on('data', (d: Buffer) => {
      output.push(d.toString())
      if (echo) process.stdout.write(d)
    })
    proc.stderr!.on('data', (d: Buffer) => {
      output.push(d.toString())
      if (echo) process.stderr.write(d)
    })
  }
  const url = `http://127.0.0.1:${port}`
  const until = Date.now() + startLimitMs
  while (Date.now() < until) {
    if (proc.exitCode !== null) throw new Error(`the app server exited with ${proc.exitCode}`)
    try {
      if ((await fetch(`${url}/api/health`)).ok) return { url, proc }
    }
    catch { /* starting */ }
    await new Promise(r => setTimeout(r, 200))
  }
  proc.kill('SIGKILL')
  throw new Error(`the app server did not start within ${startLimitMs / 1000} s`)
}

/** Stops a server started by startAppServer: SIGTERM, then SIGKILL when it has not exited within 3 s. */
export async function stopAppServer(proc: ChildProcess) {
  if (proc.exitCode !== null || proc.signalCode !== null) return
  await new Promise<void>((resolve) => {
    const t = setTimeout(() => {
      proc.kill('SIGKILL')
      resolve()
    }, 3000)
    proc.once('exit', () => {
      clearTimeout(t)
      resolve()
    })
    proc.kill('SIGTERM')
  })
}

export default async function setup(project: TestProject) {
  const templateUrl = process.env.SETLINE_TEST_DATABASE_URL
  if (!templateUrl) throw new Error('SETLINE_TEST_DATABASE_URL is not set: run the suite with npm test')
  project.provide('templateUrl', templateUrl)
  if (project.name !== 'api' && project.name !== 'e2e') return
  // the files this run will claim a server for: the project's, narrowed by the file names given
  // on the command line (npm test -- tests/api/x.test.ts passes them through)
  const args = process.argv.slice(2)
  const filters = args.filter((a, i) => a.includes('tests/') && !a.startsWith('-') && args[i - 1] !== '--project')
  const { testFiles } = await project.globTestFiles(filters.length ? filters : undefined)
  const workers = Number(project.config.maxWorkers) || 1
  const pool = await startServerPool(templateUrl, workers, testFiles.length)
  project.provide('serverPoolUrl', pool.url)
  return () => pool.stop()
}
