// Small HTTP helpers for API tests against the built server.
import { randomUUID } from 'node:crypto'
import { expect } from 'vitest'
import { testContext } from './context'

export interface CallResult<T = any> { status: number; data: T; cookie?: string; headers: Headers }

export function baseUrl() {
  return testContext().baseUrl
}

function sessionCookie(headers: Headers): string | undefined {
  const all = headers.getSetCookie?.() ?? []
  const c = all.find(h => h.startsWith('setline-session='))
  return c?.split(';')[0]
}

export async function call<T = any>(path: string, opts: { method?: string; body?: unknown; rawBody?: string; contentType?: string; form?: FormData; cookie?: string } = {}): Promise<CallResult<T>> {
  const headers: Record<string, string> = { accept: 'application/json' }
  if (opts.cookie) headers.cookie = opts.cookie
  let body: string | FormData | undefined
  // fetch sets the multipart content type with its boundary itself
  if (opts.form) body = opts.form
  else if (opts.rawBody !== undefined) {
    body = opts.rawBody
    headers['content-type'] = opts.contentType ?? 'application/json'
  }
  else if (opts.body !== undefined) {
    body = JSON.stringify(opts.body)
    headers['content-type'] = 'application/json'
  }
  const res = await fetch(baseUrl() + path, { method: opts.method ?? 'GET', headers, body, redirect: 'manual' })
  const text = await res.text()
  let data: any = text
  try {
    data = text ? JSON.parse(text) : null
  }
  catch { /* not JSON */ }
  return { status: res.status, data, cookie: sessionCookie(res.headers), headers: res.headers }
}

/** Session cookies by server and e-mail: a worker runs several files, each on a server of its own. */
const cookies = new Map<string, string>()

/** Signs in (once per e-mail and test file) and returns the session cookie. */
export async function signIn(email: string, password: string, fresh = false): Promise<string> {
  const key = `${baseUrl()} ${email}`
  if (!fresh && cookies.has(key)) return cookies.get(key)!
  const r = await call('/api/auth/login', { method: 'POST', body: { email, password } })
  if (r.status !== 200 || !r.cookie) throw new Error(`sign-in as ${email} failed: ${r.status} ${JSON.stringify(r.data)}`)
  cookies.set(key, r.cookie)
  return r.cookie
}

/**
 * A session of its own, never cached: for a request that ends the session it is sent with
 * (signing out, making the device a shared tablet), so the file's cached cookie stays live.
 */
export async function freshSession(email: string, password: string): Promise<string> {
  const r = await call('/api/auth/login', { method: 'POST', body: { email, password } })
  if (r.status !== 200 || !r.cookie) throw new Error(`sign-in as ${email} failed: ${r.status} ${JSON.stringify(r.data)}`)
  return r.cookie
}

/** A captured mail as the tests read it: its attachments with their bytes decoded. */
export interface TestMail { to: string[]; subject: string; text: string; attachments: { name: string; type: string; bytes: Buffer }[] }

/** Every mail the server's SMTP fake captured for the lead's workshop, newest first, attachments decoded. */
export async function capturedMails(leadCookie: string): Promise<TestMail[]> {
  const r = await call<{ to: string[]; subject: string; text: string; attachments: { name: string; type: string; base64: string }[] }[]>('/api/dev/mails', { cookie: leadCookie })
  if (r.status !== 200) throw new Error(`captured mail: ${r.status} ${JSON.stringify(r.data)}`)
  return r.data.map(m => ({ ...m, attachments: m.attachments.map(a => ({ name: a.name, type: a.type, bytes: Buffer.from(a.base64, 'base64') })) }))
}

/** Waits for captured mail to a recipient in the server's SMTP fake (read as a lead). */
export async function waitForMail(leadCookie: string, to: string, subjectPart: string, timeoutMs = 15_000): Promise<TestMail> {
  const until = Date.now() + timeoutMs
  while (Date.now() < until) {
    const m = (await capturedMails(leadCookie)).find(x => x.to.includes(to) && x.subject.includes(subjectPart))
    if (m) return m
    await new Promise(res => setTimeout(res, 250))
  }
  throw new Error(`no mail to ${to} about "${subjectPart}" within ${timeoutMs} ms`)
}

export function tokenFrom(text: string): string {
  const m = text.match(/token=([\w-]+)/)
  if (!m) throw new Error('no token link in the mail')
  return m[1]!
}

/**
 * A tablet step sent with a stale `version`: 409 "changed by someone else", and its replay (the
 * same actionId, now with the current version) answers the same 409, since an action id is
 * answered once. The caller then checks that nothing changed.
 */
export async function expectStaleStepRefused(url: string, cookie: string, step: Record<string, unknown> & { version: number }) {
  const body = { actionId: randomUUID(), ...step }
  const r = await call(url, { method: 'POST', cookie, body })
  expect(r.status).toBe(409)
  expect(r.data.message).toMatch(/changed by someone else/)
  const again = await call(url, { method: 'POST', cookie, body: { ...body, version: step.version + 1 } })
  expect(again.status).toBe(409)
  expect(again.data.message).toBe(r.data.message)
}

/**
 * Changes workshop settings as a lead does on the settings page: the whole form as it stands
 * (GET /api/workshop) with `patch` over it, through PATCH /api/workshop (a write, so the server
 * also drops what it keeps for a moment, server/utils/read-cache.ts). Returns the saved settings.
 */
export async function saveWorkshopSettings(leadCookie: string, patch: Record<string, unknown>) {
  const before = (await call('/api/workshop', { cookie: leadCookie })).data
  const saved = await call('/api/workshop', { method: 'PATCH', cookie: leadCookie, body: { ...before, ...patch } })
  expect(saved.status, JSON.stringify(saved.data)).toBe(200)
  return saved.data
}
