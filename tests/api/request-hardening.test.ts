// What every request passes before a route sees it (server/middleware/00.request-guard.ts,
// server/utils/photo-upload.ts) and the headers of every answer (server/utils/security-headers.ts):
// bodies capped before they are read (413), uploads streamed with a per-file cap and a cap on
// uploads at once (503 with Retry-After), only JSON or a route's multipart accepted (415),
// requests from other sites refused (403), security headers on pages and API answers, and no
// cookie from the health check. Every refusal writes nothing.
import { createHash } from 'node:crypto'
import { readdirSync } from 'node:fs'
import { request, type ClientRequest } from 'node:http'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { baseUrl, call, signIn } from '../setup/http'
import { DEMO_PASSWORD, closeTestDb, demo, demoWorkshopId, testDb } from '../setup/fixtures'
import { jpegWithGps, photoForm } from '../setup/photo-fixtures'
import { JSON_BODY_MAX_BYTES } from '../../server/utils/body-limits'
import { testContext } from '../setup/context'

const photoDir = testContext().photoDir
/** PHOTO_MAX_BYTES of the test server (tests/setup/server.ts). */
const PHOTO_MAX = 2 * 1024 * 1024
let lead = ''
let jobId = 0
let jpeg: Buffer

beforeAll(async () => {
  lead = await signIn(demo.lead.email, DEMO_PASSWORD)
  jobId = Number((await testDb()('jobs').where({ workshop_id: await demoWorkshopId(), code: 'J-2601' }).first('id')).id)
  jpeg = await jpegWithGps(320, 240)
})
afterAll(closeTestDb)

interface Answer { status: number; headers: Record<string, string | string[] | undefined>; body: string; sent: number }

/**
 * Sends a request through node:http (fetch adds and forbids headers of its own): the headers,
 * then `chunk` again and again until the server answers or `total` bytes went out. `sent` tells
 * how much of the body had gone out when the answer came.
 */
function send(path: string, opts: { method?: string; headers?: Record<string, string | number>; body?: Buffer | string; chunk?: Buffer; total?: number }): Promise<Answer> {
  const url = new URL(baseUrl() + path)
  return new Promise((resolve, reject) => {
    let sent = 0
    let answered = false
    const req: ClientRequest = request({ host: url.hostname, port: url.port, path: url.pathname + url.search, method: opts.method ?? 'POST', headers: opts.headers }, (res) => {
      answered = true
      const at = sent
      let body = ''
      res.setEncoding('utf8')
      res.on('data', (d: string) => {
        body += d
      })
      res.on('end', () => {
        req.destroy()
        resolve({ status: res.statusCode!, headers: res.headers, body, sent: at })
      })
    })
    // writing on after the server answered and closed is expected here
    req.on('error', (err) => {
      if (!answered) reject(err)
    })
    if (opts.chunk) {
      const chunk = opts.chunk
      const total = opts.total ?? chunk.length
      const pump = () => {
        while (!answered && sent < total) {
          const n = Math.min(chunk.length, total - sent)
          sent += n
          if (!req.write(chunk.subarray(0, n))) {
            req.once('drain', pump)
            return
          }
        }
        if (!answered) req.end()
      }
      pump()
    }
    else {
      if (opts.body !== undefined) sent = Buffer.byteLength(opts.body)
      req.end(opts.body)
    }
  })
}

const message = (a: Answer) => {
  try {
    return String(JSON.parse(a.body).message)
  }
  catch {
    return a.body
  }
}
const photoRows = async () => Number((await testDb()('photos').where({ job_id: jobId }).count({ n: '*' }))[0]!.n)
const storedFiles = () => readdirSync(photoDir, { recursive: true }).length
const invitationsTo = async (email: string) => Number((await testDb()('invitations').where({ email }).count({ n: '*' }))[0]!.n)

describe('request bodies are capped before they are read', () => {
  it('refuses a JSON body declared larger than the cap with 413 before it has arrived', async () => {
    const total = 64 * 1024 * 1024
    const r = await send('/api/auth/login', { headers: { 'content-type': 'application/json', 'content-length': total }, chunk: Buffer.alloc(64 * 1024, 0x20), total })
    expect(r.status).toBe(413)
    expect(message(r)).toMatch(/too large: at most 64 KB/)
    expect(r.sent).toBeLessThan(total)
  })

  it('refuses a 2 MB sign-in body with 413', async () => {
    const body = JSON.stringify({ email: 'x@example.test', password: 'p'.repeat(2 * 1024 * 1024) })
    const r = await send('/api/auth/login', { headers: { 'content-type': 'application/json', 'content-length': Buffer.byteLength(body) }, body })
    expect(r.status).toBe(413)
  })

  it('counts a chunked body (no Content-Length) as it arrives and refuses it past the cap', async () => {
    const total = 32 * 1024 * 1024
    const r = await send('/api/auth/login', { headers: { 'content-type': 'application/json', 'transfer-encoding': 'chunked' }, chunk: Buffer.alloc(16 * 1024, 0x20), total })
    expect(r.status).toBe(413)
    expect(r.sent).toBeLessThan(total)
  })

  it('still takes a chunked JSON body under the cap', async () => {
    const body = JSON.stringify({ email: demo.lead.email, password: DEMO_PASSWORD })
    const r = await send('/api/auth/login', { headers: { 'content-type': 'application/json', 'transfer-encoding': 'chunked' }, chunk: Buffer.from(body), total: Buffer.byteLength(body) })
    expect(r.status).toBe(200)
  })

  it('lets the planner accept a body larger than the default cap (and no larger than its own)', async () => {
    const pours = Array.from({ length: 2000 }, (_, i) => ({ jobItemId: 999_999_000 + i, mouldId: 999_999_000 + i, slotStart: '2027-09-16T09:00:00.000Z', casterId: null }))
    const body = JSON.stringify({ from: '2027-09-16', to: '2027-09-16', pours })
    expect(Buffer.byteLength(body)).toBeGreaterThan(JSON_BODY_MAX_BYTES)
    const before = Number((await testDb()('pours').count({ n: '*' }))[0]!.n)
    const r = await call('/api/planner/accept', { method: 'POST', cookie: lead, rawBody: body })
    // read and checked (the ids name no item of the workshop), not refused for its size
    expect(r.status).toBeGreaterThanOrEqual(400)
    expect(r.status).toBeLessThan(500)
    expect(r.status).not.toBe(413)
    expect(Number((await testDb()('pours').count({ n: '*' }))[0]!.n)).toBe(before)
    const tooBig = await call('/api/planner/accept', { method: 'POST', cookie: lead, rawBody: body + ' '.repeat(600 * 1024) })
    expect(tooBig.status).toBe(413)
  })
})

describe('photo uploads are streamed and bounded', () => {
  it('refuses a file over PHOTO_MAX_BYTES with 413 naming it, and stores nothing', async () => {
    const [rows, files] = [await photoRows(), storedFiles()]
    const big = Buffer.concat([jpeg, Buffer.alloc(PHOTO_MAX + 1024 * 1024)])
    const r = await call(`/api/jobs/${jobId}/photos`, { method: 'POST', cookie: lead, form: photoForm([{ name: 'first.jpg', data: jpeg }, { name: 'huge.jpg', data: big }]) })
    expect(r.status).toBe(413)
    expect(r.data.message).toMatch(/huge\.jpg: the file is larger than 2 MB/)
    expect([await photoRows(), storedFiles()]).toEqual([rows, files])
  })

  it('refuses an upload declared larger than every file at the limit before it has arrived', async () => {
    const rows = await photoRows()
    const total = 64 * 1024 * 1024
    const r = await send(`/api/jobs/${jobId}/photos`, { headers: { 'cookie': lead, 'content-type': 'multipart/form-data; boundary=b', 'content-length': total }, chunk: Buffer.alloc(64 * 1024, 0x2D), total })
    expect(r.status).toBe(413)
    expect(r.sent).toBeLessThan(total)
    expect(await photoRows()).toBe(rows)
  })

  it('refuses a chunked upload once it passes the bound for the whole upload', async () => {
    const rows = await photoRows()
    const total = 64 * 1024 * 1024
    const r = await send(`/api/jobs/${jobId}/photos`, { headers: { 'cookie': lead, 'content-type': 'multipart/form-data; boundary=b', 'transfer-encoding': 'chunked' }, chunk: Buffer.alloc(64 * 1024, 0x2D), total })
    expect(r.status).toBe(413)
    expect(r.sent).toBeLessThan(total)
    expect(await photoRows()).toBe(rows)
  })

  it('takes UPLOAD_MAX_CONCURRENCY (4) uploads at once; a further one gets 503 with Retry-After until one ends', async () => {
    const rows = await photoRows()
    const head = Buffer.from(`--slow\r\nContent-Disposition: form-data; name="files"; filename="slow.jpg"\r\nContent-Type: image/jpeg\r\n\r\n`)
    // four uploads that send their first bytes and then wait; what they hear, if anything, is
    // kept for the failure message (each must be signed in and reach the upload before it holds
    // a place, which on a loaded two-lane run took longer than 15 s once). A probe below can
    // hold a place for a moment while a slow one arrives, which then hears 503 itself: that one
    // starts again, as a tablet would after Retry-After, until four hold their places.
    const heard: string[] = []
    const slow: ClientRequest[] = []
    const open = (i: number) => {
      const url = new URL(baseUrl() + `/api/jobs/${jobId}/photos`)
      const req = request({ host: url.hostname, port: url.port, path: url.pathname, method: 'POST', headers: { 'cookie': lead, 'content-type': 'multipart/form-data; boundary=slow', 'transfer-encoding': 'chunked' } })
      req.on('error', err => heard.push(`upload ${i + 1}: ${err.message}`))
      req.on('response', (r) => {
        heard.push(`upload ${i + 1}: ${r.statusCode}`)
        if (r.statusCode === 503 && slow[i] === req && !req.destroyed) {
          req.destroy()
          setTimeout(() => slow[i] === req && (slow[i] = open(i)), 100)
        }
      })
      req.write(Buffer.concat([head, jpeg.subarray(0, 1000)]))
      return req
    }
    for (let i = 0; i < 4; i++) slow.push(open(i))
    const empty = () => call(`/api/jobs/${jobId}/photos`, { method: 'POST', cookie: lead, form: photoForm([], { caption: 'no file' }) })
    try {
      let refused = await empty()
      const until = Date.now() + 45_000
      while (refused.status !== 503 && Date.now() < until) {
        await new Promise(r => setTimeout(r, 100))
        refused = await empty()
      }
      expect(refused.status, `the slow uploads heard: ${heard.join('; ') || 'nothing'}`).toBe(503)
      expect(refused.headers.get('retry-after')).toBe('5')
      expect(refused.data.message).toMatch(/busy with other photo uploads/)
    }
    finally {
      const left = [...slow]
      slow.length = 0
      for (const req of left) req.destroy()
    }
    // the broken-off uploads gave their places back: the next one is read (and refused for having no file)
    await expect.poll(async () => (await empty()).status, { timeout: 15_000 }).toBe(422)
    expect(await photoRows()).toBe(rows)
  }, 120_000)

  it('still stores a normal upload', async () => {
    const r = await call(`/api/jobs/${jobId}/photos`, { method: 'POST', cookie: lead, form: photoForm([{ name: 'ok.jpg', data: jpeg }]) })
    expect(r.status, JSON.stringify(r.data)).toBe(201)
  })
})

describe('only JSON (or a file route\'s multipart) from Setline itself', () => {
  const invite = (email: string) => JSON.stringify({ email, role: 'caster' })

  it('refuses a urlencoded form post (a cross-site form) with 415 and writes nothing', async () => {
    const email = 'form-post@hardening.example.test'
    const r = await send('/api/invitations', { headers: { 'cookie': lead, 'content-type': 'application/x-www-form-urlencoded', 'origin': 'http://evil.example.test' }, body: `email=${encodeURIComponent(email)}&role=lead` })
    expect(r.status).toBe(403)
    const same = await call('/api/invitations', { method: 'POST', cookie: lead, rawBody: `email=${encodeURIComponent(email)}&role=lead`, contentType: 'application/x-www-form-urlencoded' })
    expect(same.status).toBe(415)
    expect(same.data.message).toMatch(/as JSON/)
    expect(await invitationsTo(email)).toBe(0)
  })

  it('refuses text/plain, a body without a content type, and multipart on a route without a file with 415', async () => {
    const email = 'text-post@hardening.example.test'
    expect((await call('/api/invitations', { method: 'POST', cookie: lead, rawBody: invite(email), contentType: 'text/plain' })).status).toBe(415)
    expect((await send('/api/invitations', { headers: { 'cookie': lead, 'content-length': Buffer.byteLength(invite(email)) }, body: invite(email) })).status).toBe(415)
    const form = new FormData()
    form.append('email', email)
    form.append('role', 'caster')
    expect((await call('/api/invitations', { method: 'POST', cookie: lead, form })).status).toBe(415)
    expect(await invitationsTo(email)).toBe(0)
  })

  it('refuses JSON from a foreign Origin or marked Sec-Fetch-Site: cross-site with 403; takes it from its own origin', async () => {
    const email = 'origin@hardening.example.test'
    const json = { 'cookie': lead, 'content-type': 'application/json' }
    const foreign = await send('/api/invitations', { headers: { ...json, origin: 'http://evil.example.test' }, body: invite(email) })
    expect(foreign.status).toBe(403)
    expect(message(foreign)).toMatch(/another website/)
    expect((await send('/api/invitations', { headers: { ...json, 'sec-fetch-site': 'cross-site' }, body: invite(email) })).status).toBe(403)
    expect((await send('/api/invitations', { headers: { ...json, origin: 'null' }, body: invite(email) })).status).toBe(403)
    expect(await invitationsTo(email)).toBe(0)
    const own = await send('/api/invitations', { headers: { ...json, 'origin': new URL(baseUrl()).origin, 'sec-fetch-site': 'same-origin' }, body: invite(email) })
    expect(own.status, own.body).toBe(201)
    expect(await invitationsTo(email)).toBe(1)
  })

  it('holds for the public routes: sign-in from another site is refused', async () => {
    const body = JSON.stringify({ email: demo.lead.email, password: DEMO_PASSWORD })
    const r = await send('/api/auth/login', { headers: { 'content-type': 'application/json', 'origin': 'http://evil.example.test' }, body })
    expect(r.status).toBe(403)
    expect(r.headers['set-cookie']).toBeUndefined()
    expect((await send('/api/auth/login', { headers: { 'content-type': 'application/x-www-form-urlencoded' }, body: 'email=a&password=b' })).status).toBe(415)
  })

  it('takes a bodiless POST with no content type (sign-out)', async () => {
    const cookie = await signIn(demo.caster1.email, DEMO_PASSWORD, true)
    const r = await send('/api/auth/logout', { headers: { cookie } })
    expect(r.status).toBeLessThan(300)
  })
})

describe('security headers', () => {
  const expectBase = (h: Headers) => {
    expect(h.get('content-security-policy')).toMatch(/frame-ancestors 'none'/)
    expect(h.get('x-content-type-options')).toBe('nosniff')
    expect(h.get('referrer-policy')).toBe('same-origin')
    expect(h.get('x-powered-by')).toBeNull()
  }

  it('a page carries a policy that allows exactly its own inline scripts by hash', async () => {
    const res = await fetch(`${baseUrl()}/login`)
    const html = await res.text()
    expect(res.status).toBe(200)
    expectBase(res.headers)
    const csp = res.headers.get('content-security-policy')!
    const script = csp.split(';').map(d => d.trim()).find(d => d.startsWith('script-src'))!
    expect(script).not.toMatch(/unsafe-inline|unsafe-eval/)
    expect(csp).toMatch(/object-src 'none'/)
    const inline = [...html.matchAll(/<script\b([^>]*)>([\s\S]*?)<\/script>/gi)]
      .filter(m => !/\ssrc=/.test(m[1]!) && !/type="application\/json"/.test(m[1]!))
      .map(m => `'sha256-${createHash('sha256').update(m[2]!).digest('base64')}'`)
    for (const hash of inline) expect(script).toContain(hash)
  })

  it('an API answer carries them too, and the health check sets no cookie', async () => {
    const res = await fetch(`${baseUrl()}/api/health`)
    expect(res.status).toBe(200)
    expectBase(res.headers)
    expect(res.headers.get('content-security-policy')).toMatch(/default-src 'none'/)
    expect(res.headers.getSetCookie()).toEqual([])
  })
})
