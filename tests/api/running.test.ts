// Running for real: the readiness route, structured request logs that never carry a password,
// a cookie or a link's token, and a start without a mail relay refused with a clear message.
import { spawn, type ChildProcess } from 'node:child_process'
import { resolve } from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { call } from '../setup/http'
import { testContext } from '../setup/context'
import { startAppServer } from '../setup/server'
import { demo, DEMO_PASSWORD } from '../setup/fixtures'

async function stop(proc: ChildProcess) {
  if (proc.exitCode !== null) return
  const exited = new Promise(r => proc.once('exit', r))
  proc.kill('SIGTERM')
  await exited
}

/** Starts the built server with exactly `env` and waits (30 s at most) for it to end: its exit code (null: still running, killed) and output. */
async function exitOf(env: Record<string, string>) {
  const proc = spawn(process.execPath, [resolve(import.meta.dirname, '../..', process.env.SETLINE_BUILD_DIR ?? '.output', 'server/index.mjs')], { env, stdio: ['ignore', 'pipe', 'pipe'] })
  let text = ''
  proc.stdout!.on('data', (d: Buffer) => (text += d))
  proc.stderr!.on('data', (d: Buffer) => (text += d))
  const code = await new Promise<number | null>((r) => {
    const t = setTimeout(() => {
      proc.kill('SIGKILL')
      r(null)
    }, 30_000)
    proc.once('exit', (c) => {
      clearTimeout(t)
      r(c)
    })
  })
  return { code, text }
}

const baseEnv = () => ({ DATABASE_URL: testContext().databaseUrl, NUXT_SESSION_PASSWORD: testContext().sessionPassword })

describe('GET /api/ready', () => {
  it('reports the database, the mail backlog and each repeating job\'s last run, without a cookie', async () => {
    await expect.poll(async () => {
      const r = await call('/api/ready')
      return r.status === 200 ? (r.data.jobs as { job: string; ok: boolean }[]).filter(j => j.ok).map(j => j.job).sort() : [r.status]
    }, { timeout: 20_000 }).toEqual(expect.arrayContaining(['mail-sweep', 'overdue-check']))
    const r = await call('/api/ready')
    expect(r.data).toMatchObject({ ready: true, database: 'up', backgroundWork: 'running' })
    expect(r.data.mail.backlog).toBeGreaterThanOrEqual(0)
    expect(r.cookie).toBeUndefined()
    // counts and times only: no address of anyone on the answer
    expect(JSON.stringify(r.data)).not.toContain('@')
  })

  it('counts queued mail in the backlog with the age of the oldest', async () => {
    const { testDb } = await import('../setup/fixtures')
    // queued an hour ago and held back for another hour: the sender does not take it meanwhile
    await testDb()('mail_outbox').insert({ workshop_id: null, to_email: 'waiting@example.test', kind: 'test', subject: 'Waiting', text: 'x',
      created_at: testDb().raw(`now() - interval '1 hour'`), next_attempt_at: testDb().raw(`now() + interval '1 hour'`) })
    const r = await call('/api/ready')
    expect(r.data.mail.backlog).toBeGreaterThanOrEqual(1)
    expect(r.data.mail.oldestSeconds).toBeGreaterThanOrEqual(3600)
  })
})

describe('the installable app\'s files', () => {
  it('serves the favicon, the icons and a web app manifest that names them', async () => {
    const manifest = await fetch(`${testContext().baseUrl}/manifest.webmanifest`).then(r => r.json()) as { start_url: string; icons: { src: string; sizes: string }[] }
    expect(manifest.start_url).toBe('/floor')
    for (const src of ['/favicon.png', ...manifest.icons.map(i => i.src)]) {
      const r = await fetch(`${testContext().baseUrl}${src}`)
      expect([src, r.status, r.headers.get('content-type')?.split(';')[0]]).toEqual([src, 200, src.endsWith('.svg') ? 'image/svg+xml' : 'image/png'])
    }
    const page = await fetch(`${testContext().baseUrl}/`).then(r => r.text())
    expect(page).toContain('rel="manifest" href="/manifest.webmanifest"')
  })
})

describe('request logs', () => {
  const output: string[] = []
  let server: Awaited<ReturnType<typeof startAppServer>>
  let cookie: string
  beforeAll(async () => {
    server = await startAppServer({ ...baseEnv(), LOG_LEVEL: 'info' }, output)
  })
  afterAll(async () => {
    if (server) await stop(server.proc)
  })
  const logLines = () => output.join('').split('\n').filter(l => l.startsWith('{')).map(l => JSON.parse(l) as Record<string, unknown>)

  it('give each request a line with its id, and never the password, the session cookie or a link token', async () => {
    const { url } = server
    const login = await fetch(`${url}/api/auth/login`, {
      method: 'POST', headers: { 'content-type': 'application/json', 'accept': 'application/json' },
      body: JSON.stringify({ email: demo.lead.email, password: DEMO_PASSWORD }),
    })
    expect(login.status).toBe(200)
    cookie = login.headers.getSetCookie().find(c => c.startsWith('setline-session='))!.split(';')[0]!
    const me = await fetch(`${url}/api/auth/me`, { headers: { cookie, accept: 'application/json' } })
    const id = me.headers.get('x-request-id')
    expect(id).toMatch(/^[\w-]{8,64}$/)
    const token = 'tok' + 'en-secret-'.repeat(3)
    await fetch(`${url}/reset-password?token=${token}`)
    await expect.poll(() => output.join('').includes(`/reset-password?token=`), { timeout: 10_000 }).toBe(true)
    const lines = logLines()
    expect(lines.find(l => l.reqId === id)).toMatchObject({ msg: 'request', method: 'GET', path: '/api/auth/me', status: 200 })
    expect(lines.find(l => l.path === '/api/auth/login')).toMatchObject({ method: 'POST', status: 200 })
    const all = output.join('')
    expect(all).not.toContain(DEMO_PASSWORD)
    expect(all).not.toContain(cookie.split('=')[1]!.slice(0, 40))
    expect(all).not.toContain(token)
    expect(all).toContain('token=%5Bredacted%5D')
  })

  it('show a page\'s server render reading the workshop once, however many parts of the page format with it', async () => {
    // the board's layout, page and components each format days and units with the workshop
    // (useWorkshopFormat); the server's render asks GET /api/auth/me for it once
    expect(cookie).toBeTruthy()
    const before = logLines().length
    const page = await fetch(`${server.url}/lead/board`, { headers: { cookie, accept: 'text/html' } })
    expect(page.status).toBe(200)
    await page.text()
    await expect.poll(() => logLines().slice(before).some(l => l.path === '/lead/board'), { timeout: 10_000 }).toBe(true)
    const render = logLines().slice(before)
    expect(render.filter(l => String(l.path).startsWith('/api/board')).length).toBe(1)
    expect(render.filter(l => l.path === '/api/auth/me').length).toBe(1)
  })
})

describe('a production start', () => {
  it('is refused with a clear message when neither a mail relay nor the fake is set', async () => {
    const env: Record<string, string> = { ...process.env as Record<string, string>, ...baseEnv(), NODE_ENV: 'production', MAIL_FAKE: '0', PORT: '0', HOST: '127.0.0.1' }
    delete env.SMTP_HOST
    delete env.SMTP_URL
    const { code, text } = await exitOf(env)
    expect(code).not.toBe(0)
    expect(code).not.toBeNull()
    expect(text).toMatch(/no mail relay: set SMTP_URL/)
  })

  it('ends with a clear message when its port is taken, rather than running on unreachable', async () => {
    // the file's own server holds this port: a second start on it must not stay up (on a database
    // nobody answers at, so the short-lived second server touches nothing of the first's)
    const port = new URL(testContext().baseUrl).port
    const { code, text } = await exitOf({ ...process.env as Record<string, string>, ...baseEnv(), DATABASE_URL: 'postgres://nobody@127.0.0.1:1/none', PORT: port, HOST: '127.0.0.1', MAIL_FAKE: '0', SMTP_HOST: '', SMTP_URL: 'smtp://relay.example.test:587', LOG_LEVEL: 'warn' })
    expect(code).toBe(1)
    expect(text).toMatch(new RegExp(`could not listen: listen EADDRINUSE.*:${port}\\. Is another server already using this port\\?`))
    // the first server still answers
    expect((await call('/api/health')).status).toBe(200)
  })

  it('starts with a relay given as SMTP_URL', async () => {
    const { proc, url } = await startAppServer({ ...baseEnv(), MAIL_FAKE: '0', SMTP_HOST: '', SMTP_URL: 'smtp://relay.example.test:587' }).catch(() => ({ proc: undefined, url: '' }))
    expect(url).not.toBe('')
    if (proc) await stop(proc)
  })
})
