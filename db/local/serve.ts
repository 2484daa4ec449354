// What npm start and npm run two-instances share: a check that the port is free, waiting for a
// started app to answer, and the demo sign-ins printed once it does.
import { createServer } from 'node:net'
import type { ChildProcess } from 'node:child_process'
import { DEMO_PASSWORD, DEMO_USERS } from '../seeds/demo-people'

/** Why nothing could listen on host:port now ('in use', or the error's message), or null when it could. */
export function listenProblem(host: string, port: number): Promise<string | null> {
  return new Promise((resolve) => {
    const probe = createServer()
    probe.once('error', (err: NodeJS.ErrnoException) => resolve(err.code === 'EADDRINUSE' ? 'in use' : err.message))
    probe.listen(port, host, () => probe.close(() => resolve(null)))
  })
}

/**
 * Refuses to go on when something already listens on host:port (often a Setline started
 * earlier): otherwise the health check below would hear that one and call the new start ready.
 */
export async function assertPortFree(host: string, port: number) {
  const problem = await listenProblem(host, port)
  if (problem === 'in use') throw new Error(`port ${port} on ${host} is already in use: is Setline already running at http://${host}:${port}? Stop it, or set PORT to start another`)
  if (problem) throw new Error(`cannot listen on ${host}:${port}: ${problem}`)
}

/** Waits for `url` to answer 200; stops early, with its exit code, when `child` (the started app) ends. */
export async function waitForHttp(url: string, timeoutMs: number, child?: ChildProcess) {
  const until = Date.now() + timeoutMs
  while (Date.now() < until) {
    if (child && (child.exitCode !== null || child.signalCode !== null)) throw new Error(`the app stopped (exit ${child.exitCode ?? child.signalCode}) before it answered at ${url}`)
    try {
      const r = await fetch(url)
      if (r.ok) return
    }
    catch { /* not up yet */ }
    await new Promise(r => setTimeout(r, 300))
  }
  throw new Error(`the app did not answer at ${url} within ${timeoutMs / 1000} s`)
}

/** The demo accounts, one line each, under a heading with their shared password. */
export function demoSignIns(): string[] {
  return [
    `Demo sign-ins (password for all: ${DEMO_PASSWORD}):`,
    ...DEMO_USERS.map(u => `  ${u.role.padEnd(9)} ${u.email.padEnd(36)} ${u.name.padEnd(20)}${'pin' in u ? ` tablet PIN ${u.pin}` : ''}`.trimEnd()),
  ]
}
