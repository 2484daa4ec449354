// Shared tablets: a lead signs a device in, casters and finishers set a PIN
// and switch in with it, wrong PINs are limited per device and per person, a lead revokes a
// tablet. Against the built server and real PostgreSQL.
import { createHash } from 'node:crypto'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { io, type Socket } from 'socket.io-client'
import { call, freshSession, signIn } from '../setup/http'
import { DEMO_PASSWORD, closeTestDb, demo, demoWorkshopId, makeOtherWorkshop, makeUser, setPinDirect, testDb } from '../setup/fixtures'
import { testContext } from '../setup/context'

let lead = ''
let ws = 0
const deviceIds: number[] = []

beforeAll(async () => {
  lead = await signIn(demo.lead.email, DEMO_PASSWORD)
  ws = await demoWorkshopId()
})
const sockets: Socket[] = []
afterAll(async () => {
  sockets.forEach(s => s.close())
  await testDb()('rate_limits').where('key', 'like', 'pin%').del()
  await closeTestDb()
})

function setCookieOf(headers: Headers, name: string) {
  return headers.getSetCookie().find(c => c.startsWith(`${name}=`))
}

/**
 * Signs a device in as a shared tablet (as the demo lead, in a session of its own: the call
 * ends the session it is made with); its device cookie, `setline-tablet=…`.
 */
async function newTablet(name = `Test tablet ${Math.random().toString(36).slice(2, 7)}`, oldDevice?: string) {
  const session = await freshSession(demo.lead.email, DEMO_PASSWORD)
  const r = await call('/api/tablets', { method: 'POST', cookie: oldDevice ? `${session}; ${oldDevice}` : session, body: { name } })
  expect(r.status, JSON.stringify(r.data)).toBe(201)
  deviceIds.push(r.data.id)
  const device = setCookieOf(r.headers, 'setline-tablet')!.split(';')[0]!
  return { id: r.data.id as number, device, res: r }
}

/** A fresh person of the demo workshop with a PIN. */
async function person(role: 'caster' | 'finisher' | 'lead' | 'client' = 'caster', pin = '4927') {
  const u = await makeUser(ws, role, `tablet-${role}`)
  await setPinDirect(u.id, pin)
  return u
}

const switchTo = (device: string | undefined, userId: number, pin: string) =>
  call('/api/tablet/switch', { method: 'POST', cookie: device, body: { userId, pin } })
const both = (session: string | undefined, device: string) => `${session}; ${device}`

/** A live socket with these cookies: resolves once connected, rejects when the server refuses it. */
function liveSocket(cookie: string): Promise<Socket> {
  const s = io(testContext().baseUrl, { path: '/socket.io/', transports: ['websocket'], extraHeaders: { cookie }, reconnection: false, forceNew: true })
  sockets.push(s)
  return new Promise((resolve, reject) => {
    s.once('connect', () => resolve(s))
    s.once('connect_error', err => reject(err))
  })
}

describe('signing a tablet in', () => {
  it('only a lead can: 401 signed out, 403 for caster, finisher and client', async () => {
    expect((await call('/api/tablets', { method: 'POST', body: { name: 'Nope' } })).status).toBe(401)
    for (const u of [demo.caster1, demo.finisher, demo.client1]) {
      const r = await call('/api/tablets', { method: 'POST', cookie: await signIn(u.email, DEMO_PASSWORD), body: { name: 'Nope' } })
      expect(r.status, u.role).toBe(403)
      expect(setCookieOf(r.headers, 'setline-tablet')).toBeUndefined()
    }
  })

  it('sets a long-lived httpOnly SameSite=Lax device cookie, keeps only its hash and ends the lead\'s session on the device', async () => {
    const { id, device, res } = await newTablet('Casting shop tablet')
    expect(res.data.next).toBe('/tablet')
    const set = setCookieOf(res.headers, 'setline-tablet')!
    expect(set).toMatch(/HttpOnly/i)
    expect(set).toMatch(/SameSite=Lax/i)
    expect(Number(set.match(/Max-Age=(\d+)/i)![1])).toBeGreaterThanOrEqual(300 * 86_400)
    const token = device.split('=')[1]!
    const row = await testDb()('tablet_devices').where({ id }).first()
    expect(row.token_hash).toBe(createHash('sha256').update(token).digest('hex'))
    expect(row.token_hash).not.toContain(token)
    expect(Number(row.workshop_id)).toBe(ws)
    // the session cookie is cleared in the same answer
    const session = setCookieOf(res.headers, 'setline-session')!
    expect(session).toMatch(/^setline-session=;|Max-Age=0|Expires=Thu, 01 Jan 1970/i)
    const list = await call('/api/tablets', { cookie: `${lead}; ${device}` })
    expect(list.data.find((t: { id: number }) => t.id === id)).toMatchObject({ name: 'Casting shop tablet', revokedAt: null, current: true })
  })

  it('names the field when the name is missing, and signing the same device in again revokes its old row', async () => {
    const bad = await call('/api/tablets', { method: 'POST', cookie: lead, body: { name: '  ' } })
    expect(bad.status).toBe(422)
    expect(bad.data.data.problems[0].field).toBe('name')
    const first = await newTablet()
    const second = await newTablet('Renamed', first.device)
    expect((await testDb()('tablet_devices').where({ id: first.id }).first()).revoked_at).not.toBeNull()
    expect((await testDb()('tablet_devices').where({ id: second.id }).first()).revoked_at).toBeNull()
  })
})

describe('PIN on the profile', () => {
  it('a caster sets and changes a PIN with their password; bad PINs get 422 naming the field', async () => {
    const u = await makeUser(ws, 'caster', 'pin-setter')
    const cookie = await signIn(u.email, DEMO_PASSWORD)
    expect((await call('/api/me/pin', { cookie })).data).toEqual({ hasPin: false })
    for (const pin of ['123', '123456789', '12a4', '1111', '1234', '4321', '7890', '98765', 1234]) {
      const r = await call('/api/me/pin', { method: 'PUT', cookie, body: { pin, password: DEMO_PASSWORD } })
      expect(r.status, String(pin)).toBe(422)
      expect(r.data.data.problems[0].field).toBe('pin')
    }
    const noPassword = await call('/api/me/pin', { method: 'PUT', cookie, body: { pin: '4927' } })
    expect(noPassword.status).toBe(422)
    expect(noPassword.data.data.problems[0].field).toBe('password')
    const wrong = await call('/api/me/pin', { method: 'PUT', cookie, body: { pin: '4927', password: 'not-my-password' } })
    expect(wrong.status).toBe(403)
    expect(wrong.data.data.problems[0].field).toBe('password')
    expect((await call('/api/me/pin', { cookie })).data).toEqual({ hasPin: false })
    const ok = await call('/api/me/pin', { method: 'PUT', cookie, body: { pin: '4927', password: DEMO_PASSWORD } })
    expect(ok.status).toBe(200)
    expect((await call('/api/me/pin', { cookie })).data).toEqual({ hasPin: true })
    const hash = (await testDb()('users').where({ id: u.id }).first('pin_hash')).pin_hash
    expect(hash).not.toContain('4927')
    const changed = await call('/api/me/pin', { method: 'PUT', cookie, body: { pin: '51862', password: DEMO_PASSWORD } })
    expect(changed.status).toBe(200)
    const { device } = await newTablet()
    expect((await switchTo(device, u.id, '4927')).status).toBe(401)
    expect((await switchTo(device, u.id, '51862')).status).toBe(200)
    await testDb()('rate_limits').where('key', 'like', `loginAccount:${u.email}`).del()
  })

  it('leads and clients have no PIN to set', async () => {
    for (const u of [demo.lead, demo.client1]) {
      const r = await call('/api/me/pin', { method: 'PUT', cookie: await signIn(u.email, DEMO_PASSWORD), body: { pin: '4927', password: DEMO_PASSWORD } })
      expect(r.status, u.role).toBe(403)
    }
  })

  it('a lead clears someone\'s PIN; they leave the picker and cannot switch in; another workshop\'s lead gets 404', async () => {
    const u = await person('finisher')
    const { device } = await newTablet()
    const listed = async () => (await call('/api/tablet/people', { cookie: device })).data.people.map((p: { id: number }) => p.id)
    expect(await listed()).toContain(u.id)
    const people = await call('/api/users', { cookie: lead })
    expect(people.data.find((p: { id: number }) => p.id === u.id).hasPin).toBe(true)
    const other = await makeOtherWorkshop()
    const otherLead = await signIn(other.lead.email, DEMO_PASSWORD)
    expect((await call(`/api/users/${u.id}/pin`, { method: 'DELETE', cookie: otherLead })).status).toBe(404)
    const cleared = await call(`/api/users/${u.id}/pin`, { method: 'DELETE', cookie: lead })
    expect(cleared.status).toBe(200)
    expect(await listed()).not.toContain(u.id)
    expect((await switchTo(device, u.id, '4927')).status).toBe(401)
  })
})

describe('switching person on a tablet', () => {
  it('lists the workshop\'s enabled casters and finishers with a PIN, and nothing about PINs', async () => {
    const { device } = await newTablet('Finishing tablet')
    const withPin = await person('caster')
    const withoutPin = await makeUser(ws, 'caster', 'no-pin')
    const disabled = await person('finisher')
    await testDb()('users').where({ id: disabled.id }).update({ disabled_at: new Date() })
    const leadWithPin = await person('lead')
    const r = await call('/api/tablet/people', { cookie: device })
    expect(r.status).toBe(200)
    expect(r.data.tablet.name).toBe('Finishing tablet')
    expect(r.data.workshop).toBe('Larkspur Ornamental Plaster')
    const ids = r.data.people.map((p: { id: number }) => p.id)
    expect(ids).toContain(withPin.id)
    for (const gone of [withoutPin, disabled, leadWithPin]) expect(ids).not.toContain(gone.id)
    expect(r.data.people.every((p: { role: string }) => p.role === 'caster' || p.role === 'finisher')).toBe(true)
    expect(JSON.stringify(r.data)).not.toMatch(/pin_hash|scrypt/)
  })

  it('the right PIN gives a session of that role, marked as on the tablet, that can use the role\'s routes', async () => {
    const { id, device } = await newTablet('Bench tablet')
    const caster = await person('caster', '3958')
    const r = await switchTo(device, caster.id, '3958')
    expect(r.status, JSON.stringify(r.data)).toBe(200)
    expect(r.data).toMatchObject({ id: caster.id, role: 'caster', home: '/floor' })
    const cookie = both(r.cookie, device)
    expect((await call('/api/floor/today', { cookie })).status).toBe(200)
    const me = await call('/api/auth/me', { cookie })
    expect(me.data).toMatchObject({ id: caster.id, role: 'caster' })
    const session = await call('/api/_auth/session', { cookie })
    expect(session.data.user.tablet).toEqual({ id, name: 'Bench tablet' })
    // the PIN session lives on its tablet only: without the device cookie it has ended
    expect((await call('/api/floor/today', { cookie: r.cookie })).status).toBe(401)

    const finisher = await person('finisher', '8163')
    const f = await switchTo(device, finisher.id, '8163')
    expect(f.data).toMatchObject({ role: 'finisher', home: '/finishing' })
    expect((await call('/api/floor/today', { cookie: both(f.cookie, device) })).status).toBe(403)
    expect((await call('/api/lots', { cookie: both(f.cookie, device) })).status).toBe(200)
  })

  it('refuses a wrong PIN, an unknown person, another workshop\'s, a disabled one, one without a PIN, a lead and a client alike', async () => {
    const { device } = await newTablet()
    const caster = await person('caster')
    const wrong = await switchTo(device, caster.id, '4928')
    expect(wrong.status).toBe(401)
    // an anonymous session cookie may come back, but it signs no one in
    expect((await call('/api/auth/me', { cookie: both(wrong.cookie, device) })).status).toBe(401)
    const other = await makeOtherWorkshop()
    await setPinDirect(other.caster.id, '4927')
    const disabled = await person('finisher')
    await testDb()('users').where({ id: disabled.id }).update({ disabled_at: new Date() })
    const noPin = await makeUser(ws, 'caster', 'no-pin')
    const leadWithPin = await person('lead')
    const clientWithPin = await person('client')
    // a fresh tablet per refusal, so the device limit does not answer first
    for (const userId of [999_999_999, other.caster.id, disabled.id, noPin.id, leadWithPin.id, clientWithPin.id]) {
      const r = await switchTo((await newTablet()).device, userId, '4927')
      expect(r.status, String(userId)).toBe(401)
      expect(r.data.message).toBe(wrong.data.message)
    }
  })

  it('names the field for a malformed switch', async () => {
    const { device } = await newTablet()
    const r = await switchTo(device, 0, '12')
    expect(r.status).toBe(422)
    expect(r.data.data.problems.map((p: { field: string }) => p.field).sort()).toEqual(['pin', 'userId'])
  })

  it('without a device cookie: 401, even for a signed-in lead', async () => {
    const caster = await person('caster')
    expect((await call('/api/tablet/people')).status).toBe(401)
    expect((await call('/api/tablet/people', { cookie: lead })).status).toBe(401)
    expect((await switchTo(undefined, caster.id, '4927')).status).toBe(401)
    expect((await switchTo('setline-tablet=made-up-token', caster.id, '4927')).status).toBe(401)
  })
})

describe('wrong PIN limits', () => {
  it('the 6th wrong PIN on a tablet is 429 with Retry-After, and so is the right PIN afterwards', async () => {
    const { id, device } = await newTablet()
    const caster = await person('caster', '6140')
    const statuses: number[] = []
    for (let i = 0; i < 6; i++) statuses.push((await switchTo(device, caster.id, `700${i}`)).status)
    expect(statuses.slice(0, 5)).toEqual([401, 401, 401, 401, 401])
    expect(statuses[5]).toBe(429)
    const right = await switchTo(device, caster.id, '6140')
    expect(right.status).toBe(429)
    expect((await call('/api/auth/me', { cookie: both(right.cookie, device) })).status).toBe(401)
    expect(right.data.message).toMatch(/Too many wrong PINs on this tablet\. Try again in \d+ minutes?\./)
    expect(Number(right.headers.get('retry-after'))).toBeGreaterThan(0)
    expect(Number(right.headers.get('retry-after'))).toBeLessThanOrEqual(10 * 60)
    // another person on the same tablet is held back too: the count is the device's
    const someoneElse = await person('finisher', '2581')
    expect((await switchTo(device, someoneElse.id, '2581')).status).toBe(429)
    // the same person on another tablet is not (yet)
    expect((await switchTo((await newTablet()).device, caster.id, '6140')).status).toBe(200)
    await testDb()('rate_limits').where({ key: `pinDevice:${id}` }).del()
  })

  it('wrong PINs for one person add up across tablets', async () => {
    const caster = await person('caster', '6140')
    for (let t = 0; t < 2; t++) {
      const { device } = await newTablet()
      for (let i = 0; i < 5; i++) expect((await switchTo(device, caster.id, `800${i}`)).status).toBe(401)
    }
    const third = await newTablet()
    const r = await switchTo(third.device, caster.id, '6140')
    expect(r.status).toBe(429)
    expect(r.data.message).toMatch(/Too many wrong PINs for this person/)
    expect(r.headers.get('retry-after')).toMatch(/^\d+$/)
  })
})

describe('revoking a tablet', () => {
  it('a revoked tablet cannot switch, its current session and live socket end, and its picker is refused', async () => {
    const { id, device } = await newTablet('Soon revoked')
    const caster = await person('caster', '3958')
    const on = await switchTo(device, caster.id, '3958')
    const cookie = both(on.cookie, device)
    expect((await call('/api/floor/today', { cookie })).status).toBe(200)
    // the PIN session's live socket needs the tablet's cookie as well
    await expect(liveSocket(on.cookie!)).rejects.toThrow()
    const socket = await liveSocket(cookie)
    const dropped = new Promise<string>(resolve => socket.once('disconnect', reason => resolve(reason)))
    const other = await makeOtherWorkshop()
    expect((await call(`/api/tablets/${id}/revoke`, { method: 'POST', cookie: await signIn(other.lead.email, DEMO_PASSWORD) })).status).toBe(404)
    for (const role of [demo.caster1, demo.finisher]) {
      expect((await call(`/api/tablets/${id}/revoke`, { method: 'POST', cookie: await signIn(role.email, DEMO_PASSWORD) })).status).toBe(403)
    }
    const revoked = await call(`/api/tablets/${id}/revoke`, { method: 'POST', cookie: lead })
    expect(revoked.status).toBe(200)
    expect(revoked.data.revokedAt).not.toBeNull()
    expect(await dropped).toBe('io server disconnect')
    await expect(liveSocket(cookie)).rejects.toThrow()
    const after = await call('/api/floor/today', { cookie })
    expect(after.status).toBe(401)
    expect(after.data.message).toMatch(/tablet/i)
    expect((await switchTo(device, caster.id, '3958')).status).toBe(401)
    const picker = await call('/api/tablet/people', { cookie: device })
    expect(picker.status).toBe(401)
    expect(setCookieOf(picker.headers, 'setline-tablet')).toMatch(/^setline-tablet=;|Max-Age=0|Expires=Thu, 01 Jan 1970/i)
    const list = await call('/api/tablets', { cookie: lead })
    expect(list.data.find((t: { id: number }) => t.id === id).revokedAt).not.toBeNull()
    expect((await call(`/api/tablets/${id}/revoke`, { method: 'POST', cookie: lead })).status).toBe(200)
  })
})
