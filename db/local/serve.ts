// What npm start and npm run two-instances share: waiting for a started app to answer, and
// the demo sign-ins printed once it does.
import { DEMO_PASSWORD, DEMO_USERS } from '../seeds/demo-people'

export async function waitForHttp(url: string, timeoutMs: number) {
  const until = Date.now() + timeoutMs
  while (Date.now() < until) {
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
