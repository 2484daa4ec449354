// Accounts on a shared network: captured mail stays with its workshop, made-up reset and
// invitation links are cheap and limited, one workshop cannot lock out another's people,
// the client address behind a proxy, reset links that end, and answers that tell no more
// than they must. Against the built server (and, where a setting differs, a second one).
import { randomBytes, randomUUID } from 'node:crypto'
import type { ChildProcess } from 'node:child_process'
import { afterAll, beforeEach, describe, expect, it } from 'vitest'
import { call, freshSession, signIn, tokenFrom, waitForMail } from '../setup/http'
import { DEMO_PASSWORD, closeTestDb, demo, demoWorkshopId, makeOtherWorkshop, makeUser, setPinDirect, testDb } from '../setup/fixtures'
import { startAppServer } from '../setup/server'
import { testContext } from '../setup/context'

interface Mail { to: string[]; subject: string; text: string }

beforeEach(async () => {
  await testDb()('rate_limits').del()
})
afterAll(async () => {
  await testDb()('rate_limits').del()
  await closeTestDb()
})

// A second server shares the database: its mail worker and overdue check must not pick up
// the main server's outbox while it runs
const QUIET = { MAIL_WORKER_INTERVAL_MS: '3600000', OVERDUE_CHECK_INTERVAL_MS: '3600000' }
const baseEnv = () => ({ DATABASE_URL: testContext().databaseUrl, NUXT_SESSION_PASSWORD: testContext().sessionPassword, ...QUIET })

/** Runs `use` against a second built server with these settings, and stops it afterwards. */
async function withServer(env: Record<string, string>, use: (url: string) => Promise<void>) {
  const { url, proc } = await startAppServer({ ...baseEnv(), ...env })
  try {
    await use(url)
  }
  finally {
    await stop(proc)
  }
}

async function stop(proc: ChildProcess) {
  if (proc.exitCode !== null) return
  const exited = new Promise(resolve => proc.once('exit', resolve))
  proc.kill('SIGTERM')
  const killer = setTimeout(() => proc.kill('SIGKILL'), 10_000)
  await exited
  clearTimeout(killer)
}

/** Waits until `read` gives something, re-reading every 250 ms (mail goes out through the outbox worker). */
async function eventually<T>(what: string, read: () => Promise<T | undefined>, timeoutMs = 15_000): Promise<T> {
  const until = Date.now() + timeoutMs
  while (Date.now() < until) {
    const value = await read()
    if (value !== undefined) return value
    await new Promise(resolve => setTimeout(resolve, 250))
  }
  throw new Error(`${what}: not within ${timeoutMs} ms`)
}

const mailsOf = async (lead: string) => (await call<Mail[]>('/api/dev/mails', { cookie: lead })).data
const madeUpToken = () => randomBytes(32).toString('base64url')
const fresh = (label: string) => `${label}-${randomUUID().slice(0, 8)}@fixture.example.test`

async function outboxRow(to: string) {
  return testDb()('mail_outbox').where({ to_email: to }).first('status', 'attempts', 'workshop_id')
}

async function invite(lead: string, email: string) {
  const r = await call('/api/invitations', { method: 'POST', cookie: lead, body: { email, role: 'caster' } })
  expect(r.status, JSON.stringify(r.data)).toBe(201)
  return r
}

describe('captured mail belongs to its workshop', () => {
  it('a lead sees only their own workshop\'s mail, and mail without a workshop is shown to no one', async () => {
    const demoLead = await signIn(demo.lead.email, DEMO_PASSWORD)
    const other = await makeOtherWorkshop()
    const otherLead = await signIn(other.lead.email, DEMO_PASSWORD)
    const theirs = fresh('their-invitee')
    await invite(otherLead, theirs)
    const mail = await waitForMail(otherLead, theirs, 'invited you')
    expect(mail.text).toMatch(/token=/)
    expect((await mailsOf(demoLead)).filter(m => m.to.includes(theirs))).toEqual([])

    const nobodys = fresh('nobodys')
    await testDb()('mail_outbox').insert({ workshop_id: null, to_email: nobodys, kind: 'test', subject: 'No workshop', text: 'token=secret' })
    await eventually('the outbox sends the mail', async () => (await outboxRow(nobodys))?.status === 'sent' ? true : undefined)
    expect((await mailsOf(demoLead)).filter(m => m.to.includes(nobodys))).toEqual([])
    expect((await mailsOf(otherLead)).filter(m => m.to.includes(nobodys))).toEqual([])
  })

  it('refusing counts per workshop: A\'s refusal does not touch B\'s mail', async () => {
    const [a, b] = [await makeOtherWorkshop(), await makeOtherWorkshop()]
    const [leadA, leadB] = [await signIn(a.lead.email, DEMO_PASSWORD), await signIn(b.lead.email, DEMO_PASSWORD)]
    expect((await call('/api/dev/mails/refuse', { method: 'POST', cookie: leadA, body: { count: 1 } })).data).toEqual({ refusing: 1 })
    const toB = fresh('b-invitee')
    await invite(leadB, toB)
    await waitForMail(leadB, toB, 'invited you')
    // the relay has it; the outbox marks it sent just after (under load, a moment later)
    await eventually('B\'s mail marked sent', async () => (await outboxRow(toB))?.status === 'sent' ? true : undefined)
    expect(await outboxRow(toB)).toMatchObject({ status: 'sent', attempts: 1 })
    const toA = fresh('a-invitee')
    await invite(leadA, toA)
    await waitForMail(leadA, toA, 'invited you')
    await eventually('A\'s mail marked sent', async () => (await outboxRow(toA))?.status === 'sent' ? true : undefined)
    expect(await outboxRow(toA)).toMatchObject({ status: 'sent', attempts: 2 })
  })

  it('the app does not start with the SMTP fake on an https APP_URL, unless MAIL_FAKE_EXPOSE=1', async () => {
    const env = { MAIL_FAKE: '1', APP_URL: 'https://setline.example.test' }
    await expect(startAppServer({ ...baseEnv(), ...env })).rejects.toThrow(/exited/)
    await expect(startAppServer({ ...baseEnv(), MAIL_FAKE: '1', TRUST_PROXY: '1' })).rejects.toThrow(/exited/)
    await withServer({ ...env, MAIL_FAKE_EXPOSE: '1' }, async (url) => {
      expect((await fetch(`${url}/api/health`)).ok).toBe(true)
    })
  }, 120_000)
})

describe('reset and invitation links', () => {
  it('made-up reset links are refused per address: the 11th is 429, a good link still works', async () => {
    const u = await makeUser(await demoWorkshopId(), 'finisher', 'reset-limit')
    const lead = await signIn(demo.lead.email, DEMO_PASSWORD)
    expect((await call('/api/auth/password-reset', { method: 'POST', body: { email: u.email } })).status).toBe(200)
    const token = tokenFrom((await waitForMail(lead, u.email, 'Reset your Setline password')).text)
    const confirm = (t: string) => call('/api/auth/password-reset/confirm', { method: 'POST', body: { token: t, password: 'a-long-enough-password' } })
    for (let i = 0; i < 10; i++) expect((await confirm(madeUpToken())).status).toBe(410)
    const limited = await confirm(madeUpToken())
    expect(limited.status).toBe(429)
    expect(limited.data.message).toMatch(/Too many unusable reset links from this address/)
    expect(Number(limited.headers.get('retry-after'))).toBeGreaterThan(0)
    expect((await confirm(token)).status).toBe(200)
  })

  it('made-up invitation links are refused per address: the 11th is 429, a good link still works', async () => {
    const lead = await signIn(demo.lead.email, DEMO_PASSWORD)
    const email = fresh('invite-limit')
    await invite(lead, email)
    const token = tokenFrom((await waitForMail(lead, email, 'invited you')).text)
    const accept = (t: string) => call('/api/auth/invitation', { method: 'POST', body: { token: t, name: 'Ida Fixture', password: 'a-long-enough-password' } })
    for (let i = 0; i < 10; i++) expect((await accept(madeUpToken())).status).toBe(410)
    const limited = await accept(madeUpToken())
    expect(limited.status).toBe(429)
    expect(limited.data.message).toMatch(/Too many unusable invitation links from this address/)
    expect((await accept(token)).status).toBe(200)
  })

  it('using one reset link ends the user\'s other open reset links', async () => {
    const u = await makeUser(await demoWorkshopId(), 'caster', 'two-resets')
    const lead = await signIn(demo.lead.email, DEMO_PASSWORD)
    for (let i = 0; i < 2; i++) expect((await call('/api/auth/password-reset', { method: 'POST', body: { email: u.email } })).status).toBe(200)
    const mails = await eventually('two reset mails', async () => {
      const mine = (await mailsOf(lead)).filter(m => m.to.includes(u.email))
      return mine.length === 2 ? mine : undefined
    })
    const [first, second] = mails.map(m => tokenFrom(m.text))
    const confirm = (token: string, password: string) => call('/api/auth/password-reset/confirm', { method: 'POST', body: { token, password } })
    expect((await confirm(first!, 'the-first-new-password')).status).toBe(200)
    expect((await confirm(second!, 'the-second-new-password')).status).toBe(410)
    expect((await call('/api/auth/login', { method: 'POST', body: { email: u.email, password: 'the-first-new-password' } })).status).toBe(200)
  })

  it('disabling an account ends its open reset links (even once enabled again), not the invitations it sent', async () => {
    const ws = await demoWorkshopId()
    const demoLead = await signIn(demo.lead.email, DEMO_PASSWORD)
    const u = await makeUser(ws, 'lead', 'disabled-lead')
    const uCookie = await signIn(u.email, DEMO_PASSWORD)
    const invitee = fresh('invited-by-disabled')
    await invite(uCookie, invitee)
    const invitation = tokenFrom((await waitForMail(demoLead, invitee, 'invited you')).text)
    expect((await call('/api/auth/password-reset', { method: 'POST', body: { email: u.email } })).status).toBe(200)
    const reset = tokenFrom((await waitForMail(demoLead, u.email, 'Reset your Setline password')).text)
    expect((await call(`/api/users/${u.id}`, { method: 'PATCH', cookie: demoLead, body: { disabled: true } })).status).toBe(200)
    expect((await call(`/api/users/${u.id}`, { method: 'PATCH', cookie: demoLead, body: { disabled: false } })).status).toBe(200)
    const r = await call('/api/auth/password-reset/confirm', { method: 'POST', body: { token: reset, password: 'a-long-enough-password' } })
    expect(r.status).toBe(410)
    expect((await call(`/api/auth/invitation?token=${invitation}`)).status).toBe(200)
  })

  it('a disabled account\'s right password gets exactly the wrong password\'s answer', async () => {
    const ws = await demoWorkshopId()
    const lead = await signIn(demo.lead.email, DEMO_PASSWORD)
    const [off, on] = [await makeUser(ws, 'caster', 'off'), await makeUser(ws, 'caster', 'on')]
    expect((await call(`/api/users/${off.id}`, { method: 'PATCH', cookie: lead, body: { disabled: true } })).status).toBe(200)
    const disabled = await call('/api/auth/login', { method: 'POST', body: { email: off.email, password: DEMO_PASSWORD } })
    const wrong = await call('/api/auth/login', { method: 'POST', body: { email: on.email, password: 'not-the-password' } })
    expect(disabled.status).toBe(401)
    expect(disabled.status).toBe(wrong.status)
    expect(disabled.data.message).toBe(wrong.data.message)
  })

  it('inviting another workshop\'s e-mail answers as for a new address; accepting fails for its owner; the own workshop\'s e-mail is a 409', async () => {
    const lead = await signIn(demo.lead.email, DEMO_PASSWORD)
    const other = await makeOtherWorkshop()
    const theirs = await call('/api/invitations', { method: 'POST', cookie: lead, body: { email: other.caster.email, role: 'caster' } })
    const newcomer = await call('/api/invitations', { method: 'POST', cookie: lead, body: { email: fresh('newcomer'), role: 'caster' } })
    expect(theirs.status).toBe(201)
    expect(Object.keys(theirs.data).sort()).toEqual(Object.keys(newcomer.data).sort())
    const token = tokenFrom((await waitForMail(lead, other.caster.email, 'invited you')).text)
    const accepted = await call('/api/auth/invitation', { method: 'POST', body: { token, name: 'Owner', password: 'a-long-enough-password' } })
    expect(accepted.status).toBe(409)
    expect(accepted.data.message).toBe('An account with this e-mail already exists; sign in instead')
    const own = await call('/api/invitations', { method: 'POST', cookie: lead, body: { email: demo.caster1.email, role: 'caster' } })
    expect(own.status).toBe(409)
    expect(own.data.message).toBe('A user with this e-mail already exists')
  })
})

describe('PIN limits', () => {
  // making a device a tablet ends the lead's session there: each tablet gets a session of its own
  async function tabletOf(leadEmail: string) {
    const cookie = await freshSession(leadEmail, DEMO_PASSWORD)
    const r = await call('/api/tablets', { method: 'POST', cookie, body: { name: `Tablet ${randomUUID().slice(0, 5)}` } })
    expect(r.status).toBe(201)
    return r.headers.getSetCookie().find(c => c.startsWith('setline-tablet='))!.split(';')[0]!
  }
  const switchTo = (device: string, userId: number, pin: string) => call('/api/tablet/switch', { method: 'POST', cookie: device, body: { userId, pin } })

  it('another workshop\'s tablets cannot lock a caster out: wrong PINs there spend only their own device\'s count', async () => {
    // two tablets × five wrong PINs: ten, the person's whole allowance if it were spent
    const ws = await demoWorkshopId()
    const caster = await makeUser(ws, 'caster', 'pin-target')
    await setPinDirect(caster.id, '5309')
    const other = await makeOtherWorkshop()
    for (let t = 0; t < 2; t++) {
      const device = await tabletOf(other.lead.email)
      for (let i = 0; i < 5; i++) expect((await switchTo(device, caster.id, `900${i}`)).status).toBe(401)
    }
    const own = await tabletOf(demo.lead.email)
    expect((await switchTo(own, caster.id, '5309')).status).toBe(200)
  }, 120_000) // eleven PIN checks, each a scrypt (slow on purpose)
})

describe('the client address of the per-address limits', () => {
  async function resetFrom(url: string, forwardedFor: string) {
    const res = await fetch(`${url}/api/auth/password-reset`, {
      method: 'POST',
      headers: { 'content-type': 'application/json', 'x-forwarded-for': forwardedFor },
      body: JSON.stringify({ email: 'nobody-here@fixture.example.test' }),
    })
    return res.status
  }

  it('without TRUST_PROXY, X-Forwarded-For is ignored: every request counts for the socket address', async () => {
    const statuses: number[] = []
    for (let i = 0; i < 6; i++) statuses.push(await resetFrom(testContext().baseUrl, `203.0.113.${i + 1}`))
    expect(statuses).toEqual([200, 200, 200, 200, 200, 429])
    expect(await testDb()('rate_limits').where('key', 'like', 'resetAddress:203.0.113.%')).toEqual([])
  })

  it('with TRUST_PROXY=1, the right-most X-Forwarded-For entry is the client; the entries left of it are not', async () => {
    await withServer({ MAIL_FAKE: '0', TRUST_PROXY: '1' }, async (url) => {
      const statuses: number[] = []
      // the client may write anything on the left; our proxy appends the address it saw
      for (let i = 0; i < 6; i++) statuses.push(await resetFrom(url, `198.51.100.${i + 1}, 203.0.113.9`))
      expect(statuses).toEqual([200, 200, 200, 200, 200, 429])
      expect(await resetFrom(url, '198.51.100.1, 203.0.113.10')).toBe(200)
    })
    const keys = (await testDb()('rate_limits').where('key', 'like', 'resetAddress:%').select('key')).map(r => r.key).sort()
    expect(keys).toEqual(['resetAddress:203.0.113.10', 'resetAddress:203.0.113.9'])
  }, 120_000)
})
