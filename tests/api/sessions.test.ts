// Sessions end on the server, and live sockets lose their rights at once: a cookie copied
// before sign-out is refused afterwards over HTTP and on the socket; disabling someone,
// changing their role, a password reset, signing out and revoking a tablet drop their open
// sockets; a client taken off a job stops hearing that job; a handshake from a page of
// another site is refused. Against the built server and real PostgreSQL.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { io, type Socket } from 'socket.io-client'
import { call, freshSession, signIn, tokenFrom, waitForMail } from '../setup/http'
import { DEMO_PASSWORD, closeTestDb, demo, demoWorkshopId, makeUser, setPinDirect, testDb } from '../setup/fixtures'
import { jpegWithGps, photoForm } from '../setup/photo-fixtures'
import { testContext } from '../setup/context'

const sockets: Socket[] = []
let lead = ''
let ws = 0

beforeAll(async () => {
  lead = await signIn(demo.lead.email, DEMO_PASSWORD)
  ws = await demoWorkshopId()
})
afterAll(async () => {
  sockets.forEach(s => s.close())
  await testDb()('rate_limits').del()
  await closeTestDb()
})

function connect(cookie?: string, opts: { origin?: string; transports?: string[] } = {}): Promise<Socket> {
  const extraHeaders: Record<string, string> = {}
  if (cookie) extraHeaders.cookie = cookie
  if (opts.origin) extraHeaders.origin = opts.origin
  const s = io(testContext().baseUrl, { path: '/socket.io/', transports: opts.transports ?? ['websocket'], extraHeaders, reconnection: false, forceNew: true })
  sockets.push(s)
  return new Promise((resolve, reject) => {
    s.once('connect', () => resolve(s))
    s.once('connect_error', err => reject(err))
  })
}

/** Resolves with the reason when the server drops the socket; fails when it stays open. */
function dropped(s: Socket, timeoutMs = 5000): Promise<string> {
  return new Promise((resolve, reject) => {
    const t = setTimeout(() => reject(new Error(`the socket was still open ${timeoutMs} ms after the change`)), timeoutMs)
    s.once('disconnect', (reason) => {
      clearTimeout(t)
      resolve(reason)
    })
  })
}

function nextLive(s: Socket, match: (e: { type: string; row?: { jobId?: number } }) => boolean, timeoutMs = 5000): Promise<unknown> {
  return new Promise((resolve, reject) => {
    const t = setTimeout(() => reject(new Error(`no matching live event within ${timeoutMs} ms`)), timeoutMs)
    s.on('live', (e) => {
      if (match(e)) {
        clearTimeout(t)
        resolve(e)
      }
    })
  })
}

/** A fresh person of the demo workshop, signed in: their id, e-mail and session cookie. */
async function signedIn(role: 'caster' | 'finisher' | 'client' | 'lead', label = `sessions-${role}`) {
  const u = await makeUser(ws, role, label)
  return { ...u, cookie: await freshSession(u.email, DEMO_PASSWORD) }
}

describe('sign-out ends the session on the server', () => {
  it('a cookie copied before sign-out gets 401 on HTTP and is refused on the socket; the open socket drops', async () => {
    const u = await signedIn('caster')
    const copy = u.cookie
    expect((await call('/api/auth/me', { cookie: copy })).status).toBe(200)
    const socket = await connect(copy)
    const gone = dropped(socket)
    const out = await call('/api/auth/logout', { method: 'POST', cookie: u.cookie })
    expect(out.status).toBe(200)
    expect(await gone).toBe('io server disconnect')
    const me = await call('/api/auth/me', { cookie: copy })
    expect(me.status).toBe(401)
    await expect(connect(copy)).rejects.toThrow(/sign in/)
    const rows = await testDb()('user_sessions').where({ user_id: u.id })
    expect(rows).toHaveLength(1)
    expect(rows[0].ended_at).not.toBeNull()
  })

  it('nuxt-auth-utils\' own DELETE /api/_auth/session ends the record too', async () => {
    const u = await signedIn('finisher')
    expect((await call('/api/_auth/session', { method: 'DELETE', cookie: u.cookie })).status).toBe(200)
    expect((await call('/api/auth/me', { cookie: u.cookie })).status).toBe(401)
  })

  it('signing in again in the same browser ends the session it had', async () => {
    const u = await signedIn('caster')
    const again = await call('/api/auth/login', { method: 'POST', cookie: u.cookie, body: { email: u.email, password: DEMO_PASSWORD } })
    expect(again.status).toBe(200)
    expect((await call('/api/auth/me', { cookie: u.cookie })).status).toBe(401)
    expect((await call('/api/auth/me', { cookie: again.cookie })).status).toBe(200)
  })

  it('a session whose record has expired is refused, though its sealed cookie is still good', async () => {
    const u = await signedIn('finisher')
    expect((await call('/api/auth/me', { cookie: u.cookie })).status).toBe(200)
    await testDb()('user_sessions').where({ user_id: u.id }).update({ expires_at: testDb().raw('now() - interval \'1 second\'') })
    expect((await call('/api/auth/me', { cookie: u.cookie })).status).toBe(401)
    await expect(connect(u.cookie)).rejects.toThrow(/sign in/)
  })

  it('records the session with its workshop, no tablet, a SHA-256 of its id and the cookie\'s 12 hours', async () => {
    const u = await signedIn('caster')
    const row = await testDb()('user_sessions').where({ user_id: u.id }).first()
    expect(Number(row.workshop_id)).toBe(ws)
    expect(row).toMatchObject({ tablet_id: null, ended_at: null })
    expect(row.token_hash).toMatch(/^[0-9a-f]{64}$/)
    expect(new Date(row.expires_at).getTime() - new Date(row.created_at).getTime()).toBe(12 * 3600 * 1000)
  })
})

describe('live sockets lose their rights at once', () => {
  it('disabling a caster drops their socket, and it cannot connect again', async () => {
    const u = await signedIn('caster')
    const socket = await connect(u.cookie)
    const gone = dropped(socket)
    expect((await call(`/api/users/${u.id}`, { method: 'PATCH', cookie: lead, body: { disabled: true } })).status).toBe(200)
    expect(await gone).toBe('io server disconnect')
    await expect(connect(u.cookie)).rejects.toThrow(/sign in/)
  })

  it('changing someone\'s role drops their socket', async () => {
    const u = await signedIn('caster')
    const socket = await connect(u.cookie)
    const gone = dropped(socket)
    expect((await call(`/api/users/${u.id}`, { method: 'PATCH', cookie: lead, body: { role: 'finisher' } })).status).toBe(200)
    expect(await gone).toBe('io server disconnect')
    expect((await call('/api/auth/me', { cookie: u.cookie })).status).toBe(401)
  })

  it('a password reset drops every socket of the person', async () => {
    const u = await signedIn('finisher')
    const socket = await connect(u.cookie)
    const gone = dropped(socket)
    expect((await call('/api/auth/password-reset', { method: 'POST', body: { email: u.email } })).status).toBe(200)
    const mail = await waitForMail(lead, u.email, 'Reset your Setline password')
    const done = await call('/api/auth/password-reset/confirm', { method: 'POST', body: { token: tokenFrom(mail.text), password: 'a-brand-new-password' } })
    expect(done.status).toBe(200)
    expect(await gone).toBe('io server disconnect')
    await expect(connect(u.cookie)).rejects.toThrow(/sign in/)
    // the session the reset started is a live one
    expect((await call('/api/auth/me', { cookie: done.cookie })).status).toBe(200)
  })

  it('revoking a tablet drops the socket of whoever is switched in and ends their session record', async () => {
    const made = await call('/api/tablets', { method: 'POST', cookie: await freshSession(demo.lead.email, DEMO_PASSWORD), body: { name: 'Sessions tablet' } })
    expect(made.status).toBe(201)
    const device = made.headers.getSetCookie().find(c => c.startsWith('setline-tablet='))!.split(';')[0]!
    const caster = await makeUser(ws, 'caster', 'sessions-tablet')
    await setPinDirect(caster.id, '5831')
    const switched = await call('/api/tablet/switch', { method: 'POST', cookie: device, body: { userId: caster.id, pin: '5831' } })
    expect(switched.status).toBe(200)
    const cookie = `${switched.cookie}; ${device}`
    const socket = await connect(cookie)
    const gone = dropped(socket)
    expect((await call(`/api/tablets/${made.data.id}/revoke`, { method: 'POST', cookie: lead })).status).toBe(200)
    expect(await gone).toBe('io server disconnect')
    const row = await testDb()('user_sessions').where({ user_id: caster.id }).first()
    expect(Number(row.tablet_id)).toBe(made.data.id)
    expect(row.ended_at).not.toBeNull()
  })

  it('a client taken off a job no longer hears its shared photos; their other job still reaches them', async () => {
    const k = testDb()
    const tag = Math.random().toString(36).slice(2, 7)
    const [left, kept] = await k('jobs').insert([
      { workshop_id: ws, code: `S-${tag}-1`, title: 'Job the client leaves' },
      { workshop_id: ws, code: `S-${tag}-2`, title: 'Job the client keeps' },
    ]).returning('id').then(rows => rows.map(r => Number(r.id)) as [number, number])
    const client = await signedIn('client')
    const other = await signedIn('client', 'sessions-other-client')
    await k('job_members').insert([
      { workshop_id: ws, job_id: left, user_id: client.id },
      { workshop_id: ws, job_id: kept, user_id: client.id },
      { workshop_id: ws, job_id: left, user_id: other.id },
    ])
    const socket = await connect(client.cookie)
    const stillMember = await connect(other.cookie)
    const heard: { type: string; row?: { jobId?: number } }[] = []
    socket.on('live', e => heard.push(e))
    expect((await call(`/api/jobs/${left}/members/${client.id}`, { method: 'DELETE', cookie: lead })).status).toBe(204)

    const jpeg = await jpegWithGps(64, 48)
    const share = (jobId: number) => call(`/api/jobs/${jobId}/photos`, { method: 'POST', cookie: lead, form: photoForm([{ name: 'cornice.jpg', data: jpeg }], { shared: 'true' }) })
    const otherHears = nextLive(stillMember, e => e.type === 'photo.created' && e.row?.jobId === left)
    expect((await share(left)).status).toBe(201)
    await otherHears
    // one socket gets its events in order: the kept job's photo arriving after the left job's
    // shows the left job's event was never sent to it
    const keptHeard = nextLive(socket, e => e.type === 'photo.created' && e.row?.jobId === kept)
    expect((await share(kept)).status).toBe(201)
    await keptHeard
    expect(socket.connected).toBe(true)
    expect(heard.filter(e => e.row?.jobId === left)).toEqual([])
  })
})

describe('the socket handshake\'s Origin', () => {
  it('refuses a page of another site and accepts the app\'s own origin, on websocket and polling', async () => {
    const u = await signedIn('caster')
    await expect(connect(u.cookie, { origin: 'https://attacker.example' })).rejects.toThrow(/does not come from a Setline page/)
    await expect(connect(u.cookie, { origin: 'https://attacker.example', transports: ['polling'] })).rejects.toThrow()
    await expect(connect(u.cookie, { origin: 'null' })).rejects.toThrow(/does not come from a Setline page/)
    const own = await connect(u.cookie, { origin: new URL(testContext().baseUrl).origin })
    expect(own.connected).toBe(true)
    const polling = await connect(u.cookie, { origin: new URL(testContext().baseUrl).origin, transports: ['polling'] })
    expect(polling.connected).toBe(true)
  })
})
