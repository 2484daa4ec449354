// What the benchmark scripts need around the built server: a database with the demo workshop,
// a server process of the bench's own (so its memory figures are its own), sign-in, and the
// server's resident memory read from /proc. When run.ts starts the scripts it hands them one
// throwaway PostgreSQL in BENCH_DATABASE_URL; a script run alone starts its own.
import { existsSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { randomBytes } from 'node:crypto'
import { startThrowawayDb } from '../../setup/throwaway-db'
import { startAppServer } from '../../setup/server'
import { seedIfEmpty } from '../../../db/local/cluster'
import { root } from '../../../db/local/config'

export { DEMO_PASSWORD, DEMO_USERS } from '../../../db/seeds/demo-people'

/** The database for a bench: run.ts's shared one, or a throwaway of its own; the demo is seeded. */
export async function benchDatabase(): Promise<{ url: string; stop: () => void }> {
  const shared = process.env.BENCH_DATABASE_URL
  if (shared) {
    await seedIfEmpty(shared)
    return { url: shared, stop: () => undefined }
  }
  const db = await startThrowawayDb()
  await seedIfEmpty(db.url)
  return db
}

export interface BenchServer {
  url: string
  pid: number
  /** the session secret, for a second instance that must accept this one's cookies */
  sessionPassword: string
  stop: () => Promise<void>
}

/**
 * The built server (.output) on a free port with the production intervals of the mail worker
 * and the overdue check (the test defaults poll every second, which a benchmark would measure).
 * Photos go to a temp folder removed on stop.
 */
export async function startBenchServer(databaseUrl: string, env: Record<string, string> = {}): Promise<BenchServer> {
  if (!existsSync(join(root, '.output/server/index.mjs'))) throw new Error('no build in .output: run `npx nuxt build` (or npm test) first')
  const photoDir = mkdtempSync(join(tmpdir(), 'setline-bench-photos-'))
  const sessionPassword = env.NUXT_SESSION_PASSWORD ?? randomBytes(24).toString('hex')
  const { url, proc } = await startAppServer({
    DATABASE_URL: databaseUrl, NUXT_SESSION_PASSWORD: sessionPassword,
    MAIL_FAKE: '0', SMTP_HOST: '127.0.0.1', SMTP_PORT: '9', LOG_LEVEL: 'warn', MAIL_WORKER_INTERVAL_MS: '5000', MAIL_RETRY_BASE_SECONDS: '15',
    OVERDUE_CHECK_INTERVAL_MS: '60000', PHOTO_STORAGE_DIR: photoDir, ...env,
  })
  return {
    url,
    pid: proc.pid!,
    sessionPassword,
    async stop() {
      if (proc.exitCode === null) {
        const exited = new Promise(r => proc.once('exit', r))
        proc.kill('SIGTERM')
        await Promise.race([exited, new Promise(r => setTimeout(r, 3000))])
        if (proc.exitCode === null) proc.kill('SIGKILL')
      }
      rmSync(photoDir, { recursive: true, force: true })
    },
  }
}

/** Signs in through the API and returns the session cookie (name=value). */
export async function signIn(base: string, email: string, password: string): Promise<string> {
  const r = await fetch(`${base}/api/auth/login`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ email, password }) })
  const cookie = r.headers.getSetCookie().find(c => c.startsWith('setline-session='))?.split(';')[0]
  if (r.status !== 200 || !cookie) throw new Error(`sign-in as ${email} failed with ${r.status}`)
  return cookie
}

/** A field of /proc/<pid>/status in kB (VmRSS: resident now; VmHWM: the peak since start or reset). */
export function procKb(pid: number, field: 'VmRSS' | 'VmHWM'): number {
  const status = readFileSync(`/proc/${pid}/status`, 'utf8')
  return Number(status.match(new RegExp(`${field}:\\s+(\\d+)`))?.[1] ?? NaN)
}

/**
 * Watches a process's resident memory: resets the kernel's peak (writing 5 to clear_refs, see
 * proc(5)) so VmHWM covers only what follows, and polls VmRSS as well in case the reset is not
 * allowed. stop() answers the peak in kB.
 */
export function watchPeakRss(pid: number, everyMs = 25) {
  let resetOk = true
  try {
    writeFileSync(`/proc/${pid}/clear_refs`, '5')
  }
  catch {
    resetOk = false
  }
  const startKb = procKb(pid, 'VmRSS')
  let polled = startKb
  const timer = setInterval(() => {
    try {
      polled = Math.max(polled, procKb(pid, 'VmRSS'))
    }
    catch { /* the process ended */ }
  }, everyMs)
  return {
    startKb,
    stop(): number {
      clearInterval(timer)
      const hwm = resetOk ? procKb(pid, 'VmHWM') : 0
      return Math.max(polled, hwm)
    },
  }
}
