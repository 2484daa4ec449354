// vitest globalSetup for the api and e2e projects: starts the built server (.output) against
// the run's throwaway database, with its own SMTP fake, and stops it afterwards.
import { spawn, type ChildProcess } from 'node:child_process'
import { existsSync, mkdtempSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { randomBytes } from 'node:crypto'
import { join, resolve } from 'node:path'
import type { TestProject } from 'vitest/node'
import { freePort } from './throwaway-db'

declare module 'vitest' {
  export interface ProvidedContext { baseUrl: string; databaseUrl: string; sessionPassword: string; photoDir: string }
}

let child: ChildProcess | undefined

/** Starts the built app; with `output`, what it prints is also collected there (a test reads its log). */
export async function startAppServer(env: Record<string, string>, output?: string[]) {
  const root = resolve(import.meta.dirname, '../..')
  if (!existsSync(resolve(root, '.output/server/index.mjs'))) throw new Error('No build in .output: run npm test (it builds first)')
  const [port, smtpPort] = [await freePort(), await freePort()]
  const proc = spawn(process.execPath, [resolve(root, '.output/server/index.mjs')], {
    cwd: root,
    env: {
      ...process.env, HOST: '127.0.0.1', PORT: String(port), APP_URL: `http://127.0.0.1:${port}`,
      MAIL_FAKE: '1', SMTP_PORT: String(smtpPort),
      MAIL_WORKER_INTERVAL_MS: '500', MAIL_RETRY_BASE_SECONDS: '1', OVERDUE_CHECK_INTERVAL_MS: '1000', ...env,
    },
    stdio: ['ignore', output ? 'pipe' : 'inherit', output ? 'pipe' : 'inherit'],
  })
  if (output) {
    proc.stdout!.on('data', (d: Buffer) => {
      output.push(d.toString())
      process.stdout.write(d)
    })
    proc.stderr!.on('data', (d: Buffer) => {
      output.push(d.toString())
      process.stderr.write(d)
    })
  }
  const url = `http://127.0.0.1:${port}`
  const until = Date.now() + 60_000
  while (Date.now() < until) {
    if (proc.exitCode !== null) throw new Error(`the app server exited with ${proc.exitCode}`)
    try {
      if ((await fetch(`${url}/api/health`)).ok) return { url, proc }
    }
    catch { /* starting */ }
    await new Promise(r => setTimeout(r, 200))
  }
  proc.kill('SIGKILL')
  throw new Error('the app server did not start within 60 s')
}

export default async function setup(project: TestProject) {
  const databaseUrl = process.env.SETLINE_TEST_DATABASE_URL
  if (!databaseUrl) throw new Error('SETLINE_TEST_DATABASE_URL is not set: run the suite with npm test')
  const sessionPassword = randomBytes(24).toString('hex')
  // photos go to a throwaway folder; a 2 MB limit lets the tests send an oversize file cheaply
  const photoDir = mkdtempSync(join(tmpdir(), 'setline-photos-'))
  const started = await startAppServer({ DATABASE_URL: databaseUrl, NUXT_SESSION_PASSWORD: sessionPassword, PHOTO_STORAGE_DIR: photoDir, PHOTO_MAX_BYTES: String(2 * 1024 * 1024) })
  child = started.proc
  project.provide('baseUrl', started.url)
  project.provide('databaseUrl', databaseUrl)
  project.provide('sessionPassword', sessionPassword)
  project.provide('photoDir', photoDir)
  return async () => {
    child?.kill('SIGTERM')
    await new Promise(r => setTimeout(r, 300))
    if (child && child.exitCode === null) child.kill('SIGKILL')
    rmSync(photoDir, { recursive: true, force: true })
  }
}
