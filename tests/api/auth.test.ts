// Sign-in, rate limits, session end on disable, invitation and reset round trips (real
// PostgreSQL, the built server, its SMTP fake).
import { afterAll, describe, expect, it } from 'vitest'
import { call, signIn, tokenFrom, waitForMail } from '../setup/http'
import { DEMO_PASSWORD, closeTestDb, demo, demoWorkshopId, makeUser, testDb } from '../setup/fixtures'

afterAll(closeTestDb)

describe('sign-in', () => {
  it('signs in each demo role and tells where home is', async () => {
    const homes = { lead: '/lead', caster: '/floor', finisher: '/finishing', client: '/client' } as const
    for (const u of [demo.lead, demo.caster1, demo.finisher, demo.client1]) {
      const r = await call('/api/auth/login', { method: 'POST', body: { email: u.email, password: DEMO_PASSWORD } })
      expect(r.status).toBe(200)
      expect(r.data.role).toBe(u.role)
      expect(r.data.home).toBe(homes[u.role])
      expect(r.cookie).toMatch(/^setline-session=/)
      const me = await call('/api/auth/me', { cookie: r.cookie })
      expect(me.status).toBe(200)
      expect(me.data.email).toBe(u.email)
      expect(me.data.workshop.name).toBe('Larkspur Ornamental Plaster')
    }
  })

  it('accepts the e-mail in any letter case', async () => {
    const r = await call('/api/auth/login', { method: 'POST', body: { email: demo.lead.email.toUpperCase(), password: DEMO_PASSWORD } })
    expect(r.status).toBe(200)
  })

  it('refuses a wrong password and an unknown account with the same message', async () => {
    const ws = await demoWorkshopId()
    const u = await makeUser(ws, 'caster')
    const wrong = await call('/api/auth/login', { method: 'POST', body: { email: u.email, password: 'not-the-password' } })
    const unknown = await call('/api/auth/login', { method: 'POST', body: { email: 'nobody@fixture.example.test', password: 'whatever-it-is' } })
    expect(wrong.status).toBe(401)
    expect(unknown.status).toBe(401)
    expect(wrong.data.message).toBe(unknown.data.message)
    // an anonymous session cookie may be set, but it must not sign anyone in
    expect((await call('/api/auth/me', { cookie: wrong.cookie })).status).toBe(401)
    await testDb()('rate_limits').del()
  })

  it('names the bad field with 422, and malformed JSON gets 400', async () => {
    const noEmail = await call('/api/auth/login', { method: 'POST', body: { password: 'x' } })
    expect(noEmail.status).toBe(422)
    expect(noEmail.data.message).toMatch(/^email/)
    const badEmail = await call('/api/auth/login', { method: 'POST', body: { email: 'not-an-email', password: 'x' } })
    expect(badEmail.status).toBe(422)
    expect(badEmail.data.data.problems[0].field).toBe('email')
    const malformed = await call('/api/auth/login', { method: 'POST', rawBody: '{"email": ' })
    expect(malformed.status).toBe(400)
  })

  it('limits failed sign-ins per account, even for the right password afterwards', async () => {
    const ws = await demoWorkshopId()
    const u = await makeUser(ws, 'finisher')
    const statuses: number[] = []
    for (let i = 0; i < 6; i++) {
      statuses.push((await call('/api/auth/login', { method: 'POST', body: { email: u.email, password: `wrong-${i}-password` } })).status)
    }
    expect(statuses.slice(0, 4)).toEqual([401, 401, 401, 401])
    expect(statuses[5]).toBe(429)
    const right = await call('/api/auth/login', { method: 'POST', body: { email: u.email, password: DEMO_PASSWORD } })
    expect(right.status).toBe(429)
    expect(right.data.message).toMatch(/Too many failed sign-ins for this account\. Try again in \d+ minutes?/)
    expect(Number(right.headers.get('retry-after'))).toBeGreaterThan(0)
    // the limit lives in PostgreSQL, so it holds across app instances
    const rows = await testDb()('rate_limits').where('key', 'like', `loginAccount:${u.email}`)
    expect(rows).toHaveLength(1)
    await testDb()('rate_limits').del()
    const after = await call('/api/auth/login', { method: 'POST', body: { email: u.email, password: DEMO_PASSWORD } })
    expect(after.status).toBe(200)
  })

  it('signs out', async () => {
    const cookie = await signIn(demo.caster2.email, DEMO_PASSWORD, true)
    const out = await call('/api/auth/logout', { method: 'POST', cookie })
    expect(out.status).toBe(200)
    const cleared = out.headers.getSetCookie().find(c => c.startsWith('setline-session='))
    expect(cleared).toBeDefined()
  })
})

describe('sessions end', () => {
  it('when a lead disables the user, and a disabled user cannot sign in', async () => {
    const ws = await demoWorkshopId()
    const u = await makeUser(ws, 'caster')
    const userCookie = await signIn(u.email, DEMO_PASSWORD)
    expect((await call('/api/auth/me', { cookie: userCookie })).status).toBe(200)
    const lead = await signIn(demo.lead.email, DEMO_PASSWORD)
    const off = await call(`/api/users/${u.id}`, { method: 'PATCH', cookie: lead, body: { disabled: true } })
    expect(off.status).toBe(200)
    expect(off.data.disabledAt).not.toBeNull()
    const me = await call('/api/auth/me', { cookie: userCookie })
    expect(me.status).toBe(401)
    const again = await call('/api/auth/login', { method: 'POST', body: { email: u.email, password: DEMO_PASSWORD } })
    expect(again.status).toBe(401)
    // the same answer as a wrong password: it must not confirm that the password was right
    expect(again.data.message).toBe('E-mail or password is wrong')
    await testDb()('rate_limits').del()
  })

  it('a lead cannot disable themselves', async () => {
    const lead = await signIn(demo.lead.email, DEMO_PASSWORD)
    const me = await call('/api/auth/me', { cookie: lead })
    const r = await call(`/api/users/${me.data.id}`, { method: 'PATCH', cookie: lead, body: { disabled: true } })
    expect(r.status).toBe(422)
    expect(r.data.message).toMatch(/^id/)
  })
})

describe('invitation round trip through the SMTP fake', () => {
  it('lead invites, the mail carries a one-time link, the new user sets a password and lands home', async () => {
    const lead = await signIn(demo.lead.email, DEMO_PASSWORD)
    const email = `new-caster-${Date.now()}@fixture.example.test`
    const inv = await call('/api/invitations', { method: 'POST', cookie: lead, body: { email, role: 'caster', name: 'Nell Fixture' } })
    expect(inv.status).toBe(201)
    const mail = await waitForMail(lead, email, 'invited you')
    const token = tokenFrom(mail.text)
    const info = await call(`/api/auth/invitation?token=${token}`)
    expect(info.status).toBe(200)
    expect(info.data).toMatchObject({ email, role: 'caster', workshop: 'Larkspur Ornamental Plaster' })
    const weak = await call('/api/auth/invitation', { method: 'POST', body: { token, name: 'Nell', password: 'short' } })
    expect(weak.status).toBe(422)
    expect(weak.data.message).toMatch(/^password/)
    const ok = await call('/api/auth/invitation', { method: 'POST', body: { token, name: 'Nell Fixture', password: 'a-long-enough-password' } })
    expect(ok.status).toBe(200)
    expect(ok.data.home).toBe('/floor')
    const me = await call('/api/auth/me', { cookie: ok.cookie })
    expect(me.data).toMatchObject({ email, role: 'caster' })
    const reuse = await call('/api/auth/invitation', { method: 'POST', body: { token, name: 'Nell', password: 'a-long-enough-password' } })
    expect(reuse.status).toBe(410)
  })

  it('refuses to invite an e-mail that already has an account (409)', async () => {
    const lead = await signIn(demo.lead.email, DEMO_PASSWORD)
    const r = await call('/api/invitations', { method: 'POST', cookie: lead, body: { email: demo.caster1.email, role: 'caster' } })
    expect(r.status).toBe(409)
  })
})

describe('password reset round trip', () => {
  it('sends a link, sets the new password, ends old sessions; the link works once', async () => {
    const ws = await demoWorkshopId()
    const u = await makeUser(ws, 'finisher')
    const oldSession = await signIn(u.email, DEMO_PASSWORD)
    const req = await call('/api/auth/password-reset', { method: 'POST', body: { email: u.email } })
    expect(req.status).toBe(200)
    const unknown = await call('/api/auth/password-reset', { method: 'POST', body: { email: 'nobody@fixture.example.test' } })
    expect(unknown.data.message).toBe(req.data.message)
    const lead = await signIn(demo.lead.email, DEMO_PASSWORD)
    const mail = await waitForMail(lead, u.email, 'Reset your Setline password')
    const token = tokenFrom(mail.text)
    const done = await call('/api/auth/password-reset/confirm', { method: 'POST', body: { token, password: 'a-brand-new-password' } })
    expect(done.status).toBe(200)
    expect((await call('/api/auth/me', { cookie: oldSession })).status).toBe(401)
    expect((await call('/api/auth/me', { cookie: done.cookie })).status).toBe(200)
    const old = await call('/api/auth/login', { method: 'POST', body: { email: u.email, password: DEMO_PASSWORD } })
    expect(old.status).toBe(401)
    const fresh = await call('/api/auth/login', { method: 'POST', body: { email: u.email, password: 'a-brand-new-password' } })
    expect(fresh.status).toBe(200)
    const again = await call('/api/auth/password-reset/confirm', { method: 'POST', body: { token, password: 'another-new-password' } })
    expect(again.status).toBe(410)
    await testDb()('rate_limits').del()
  })
})
