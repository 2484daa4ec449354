// Photo routes: refusals by content (not by name) with clear 4xx answers, variants stored with
// no metadata, who may see or change a photo (404 for everyone else), deletion of the files,
// and the client's progress route.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { existsSync, readdirSync } from 'node:fs'
import { join } from 'node:path'
import sharp from 'sharp'
import { call, baseUrl, signIn } from '../setup/http'
import { DEMO_PASSWORD, closeTestDb, demo, demoWorkshopId, makeOtherWorkshop, testDb } from '../setup/fixtures'
import { boardFixture } from '../setup/board-fixtures'
import { jpegWithGps, photoForm, pixelBombPng, type UploadFile } from '../setup/photo-fixtures'
import { testContext } from '../setup/context'

const c = { lead: '', caster: '', caster2: '', finisher: '', client: '', client2: '' }
let fernhill = 0
let jpeg: Buffer
const photoDir = testContext().photoDir

beforeAll(async () => {
  c.lead = await signIn(demo.lead.email, DEMO_PASSWORD)
  c.caster = await signIn(demo.caster1.email, DEMO_PASSWORD)
  c.caster2 = await signIn(demo.caster2.email, DEMO_PASSWORD)
  c.finisher = await signIn(demo.finisher.email, DEMO_PASSWORD)
  c.client = await signIn(demo.client1.email, DEMO_PASSWORD)
  c.client2 = await signIn(demo.client2.email, DEMO_PASSWORD)
  fernhill = Number((await testDb()('jobs').where({ workshop_id: await demoWorkshopId(), code: 'J-2601' }).first('id')).id)
  jpeg = await jpegWithGps(1200, 900)
})
afterAll(closeTestDb)

function upload(cookie: string, files: UploadFile[], fields: Record<string, string> = {}, jobId = fernhill) {
  return call(`/api/jobs/${jobId}/photos`, { method: 'POST', cookie, form: photoForm(files, fields) })
}
async function uploadOne(cookie: string, fields: Record<string, string> = {}) {
  const r = await upload(cookie, [{ name: 'cornice.jpg', data: jpeg }], fields)
  expect(r.status, JSON.stringify(r.data)).toBe(201)
  return r.data[0] as { id: string; shared: boolean }
}
async function keysOf(id: string) {
  return testDb()('photos').where({ id }).first('thumb_key', 'display_key')
}
const variant = (cookie: string, id: string, v = 'thumb') => fetch(`${baseUrl()}/api/photos/${id}/${v}`, { headers: { cookie } })

describe('upload refusals', () => {
  it('refuses, by content, what is not a usable photo, each with a clear 4xx', async () => {
    const text = Buffer.from('Cornice run, 18.6 m, egg-and-dart.\n'.repeat(20))
    const cases: [string, UploadFile, number, RegExp][] = [
      ['a text file named .jpg', { name: 'photo.jpg', data: text }, 415, /not a photo Setline can read/],
      ['random bytes named .png', { name: 'scan.png', data: Buffer.from(Array.from({ length: 4096 }, (_, i) => (i * 37) % 256)) }, 415, /not a photo/],
      ['an oversize file', { name: 'huge.jpg', data: Buffer.concat([jpeg, Buffer.alloc(2 * 1024 * 1024)]) }, 413, /larger than 2 MB/],
      ['a pixel bomb', { name: 'bomb.png', data: await pixelBombPng(), type: 'image/png' }, 413, /megapixels/],
      ['an empty file', { name: 'empty.jpg', data: Buffer.alloc(0) }, 422, /empty/],
    ]
    for (const [label, file, status, message] of cases) {
      const r = await upload(c.caster, [file])
      expect(r.status, label).toBe(status)
      expect(r.data.message, label).toMatch(message)
      expect(r.data.message, label).toContain(file.name)
    }
    expect(await testDb()('photos').where({ job_id: fernhill, bytes: 0 }).first()).toBeUndefined()
  }, 60_000)

  it('validates the fields and the links to pieces and pours of the job', async () => {
    const none = await call(`/api/jobs/${fernhill}/photos`, { method: 'POST', cookie: c.caster, form: photoForm([], { caption: 'x' }) })
    expect(none.status).toBe(422)
    expect(none.data.data.problems[0].field).toBe('files')
    const file = [{ name: 'a.jpg', data: jpeg }]
    for (const [field, value] of [['shared', 'maybe'], ['pieceId', 'abc'], ['caption', 'x'.repeat(301)]] as const) {
      const r = await upload(c.caster, file, { [field]: value })
      expect(r.status, field).toBe(422)
      expect(r.data.data.problems[0].field).toBe(field)
    }
    const otherPiece = await testDb()('pieces').where({ mark: 'J-2602#001' }).first('id', 'pour_id')
    const piece = await upload(c.caster, file, { pieceId: String(otherPiece.id) })
    expect([piece.status, piece.data.data.problems[0].field]).toEqual([422, 'pieceId'])
    const pour = await upload(c.caster, file, { pourId: String(otherPiece.pour_id) })
    expect([pour.status, pour.data.data.problems[0].field]).toEqual([422, 'pourId'])
    const own = await testDb()('pieces').where({ mark: 'J-2601#001' }).first('id', 'pour_id')
    const linked = await upload(c.caster, file, { pieceId: String(own.id), caption: 'First length' })
    expect(linked.status).toBe(201)
    expect(linked.data[0]).toMatchObject({ pieceId: Number(own.id), pourId: Number(own.pour_id), caption: 'First length', shared: false })
    expect((await upload(c.caster, file, {}, 999_999_999)).status).toBe(404)
  })
})

describe('stored variants', () => {
  it('stores several photos at once as WebP thumb and display with no EXIF or GPS', async () => {
    const before = await sharp(jpeg).metadata()
    expect(before.exif?.length).toBeGreaterThan(0)
    const r = await upload(c.caster, [{ name: 'a.jpg', data: jpeg }, { name: 'b.jpg', data: jpeg }], { caption: 'Lengths on the rack', shared: 'true' })
    expect(r.status).toBe(201)
    expect(r.data).toHaveLength(2)
    expect(r.data[0]).toMatchObject({ caption: 'Lengths on the rack', shared: true, width: 900, height: 1200, bytes: jpeg.length })
    expect(r.data[0]).not.toHaveProperty('thumb_key')
    const keys = await keysOf(r.data[0].id)
    expect(keys.thumb_key).toMatch(/^[0-9a-f-]{36}\.webp$/)
    for (const key of [keys.thumb_key, keys.display_key]) {
      expect(existsSync(join(photoDir, key))).toBe(true)
    }
    for (const v of ['thumb', 'display']) {
      const res = await variant(c.client, r.data[0].id, v)
      expect(res.status).toBe(200)
      expect(res.headers.get('content-type')).toBe('image/webp')
      expect(res.headers.get('cache-control')).toMatch(/^private/)
      const m = await sharp(Buffer.from(await res.arrayBuffer())).metadata()
      expect(m.format).toBe('webp')
      expect(m.exif).toBeUndefined()
      expect(m.xmp).toBeUndefined()
      expect(m.height).toBeGreaterThan(m.width!)
    }
    expect((await variant(c.client, r.data[0].id, 'original')).status).toBe(422)
  })
})

describe('an upload with an action id (the tablet\'s outbox)', () => {
  const files = (n: number) => Array.from({ length: n }, (_, i) => ({ name: `retry-${i}.jpg`, data: jpeg }))
  const stored = (actionId: string) => testDb()('processed_actions').where({ id: actionId }).first('kind', 'status')
  const filesInStore = () => readdirSync(photoDir, { recursive: true }).length

  it('is stored once however often it is sent, the replay answered with the first photos', async () => {
    const actionId = crypto.randomUUID()
    const first = await upload(c.caster, files(2), { caption: 'Sent twice', actionId })
    expect(first.status, JSON.stringify(first.data)).toBe(201)
    expect(await stored(actionId)).toEqual({ kind: 'photo.upload', status: 200 })
    const inStore = filesInStore()
    // the answer was lost on the way back: the outbox sends the same upload again, twice at once
    const again = await Promise.all([upload(c.caster, files(2), { caption: 'Sent twice', actionId }), upload(c.caster, files(2), { caption: 'Sent twice', actionId })])
    for (const r of again) {
      expect(r.status).toBe(201)
      expect(r.data.map((p: { id: string }) => p.id)).toEqual(first.data.map((p: { id: string }) => p.id))
    }
    expect(await testDb()('photos').where({ job_id: fernhill, caption: 'Sent twice' }).count('* as n').first()).toEqual({ n: '2' })
    // nothing of the copies is left in the photo store
    expect(filesInStore()).toBe(inStore)
  })

  it('two copies racing before either is answered still store the photos once', async () => {
    const actionId = crypto.randomUUID()
    const both = await Promise.all([upload(c.caster, files(1), { caption: 'Raced', actionId }), upload(c.caster, files(1), { caption: 'Raced', actionId })])
    expect(both.map(r => r.status)).toEqual([201, 201])
    expect(both[0]!.data[0].id).toBe(both[1]!.data[0].id)
    expect(await testDb()('photos').where({ job_id: fernhill, caption: 'Raced' }).count('* as n').first()).toEqual({ n: '1' })
  })

  it('an id reused by another person, or for another job, is a 409 and stores nothing', async () => {
    const actionId = crypto.randomUUID()
    expect((await upload(c.caster, files(1), { caption: 'Bound', actionId })).status).toBe(201)
    const other = await upload(c.caster2, files(1), { caption: 'Bound', actionId })
    expect(other.status).toBe(409)
    expect(other.data.message).toMatch(/another person/)
    const ws = await demoWorkshopId()
    const [job] = await testDb()('jobs').insert({ workshop_id: ws, code: `AID-${actionId.slice(0, 6)}`, title: 'Another job' }).returning('id')
    const elsewhere = await upload(c.caster, files(1), { caption: 'Bound', actionId }, Number(job.id))
    expect(elsewhere.status).toBe(409)
    expect(await testDb()('photos').where({ caption: 'Bound' }).count('* as n').first()).toEqual({ n: '1' })
    const bad = await upload(c.caster, files(1), { actionId: 'not-a-uuid' })
    expect(bad.status).toBe(422)
    expect(bad.data.message).toMatch(/UUID/)
  })
})

describe('who sees and changes a photo', () => {
  it('a client sees only shared photos of their own jobs; everything else is 404', async () => {
    const hidden = await uploadOne(c.caster)
    const shared = await uploadOne(c.caster, { shared: 'true' })
    expect((await variant(c.client, hidden.id)).status).toBe(404)
    expect((await variant(c.client, shared.id)).status).toBe(200)
    expect((await variant(c.client2, shared.id)).status).toBe(404)
    const list = await call(`/api/client/jobs/${fernhill}/photos`, { cookie: c.client })
    const ids = list.data.map((p: { id: string }) => p.id)
    expect(ids).toContain(shared.id)
    expect(ids).not.toContain(hidden.id)
    expect(Object.keys(list.data[0]).sort()).toEqual(['caption', 'createdAt', 'height', 'id', 'width'])
    expect((await call(`/api/client/jobs/${fernhill}/photos`, { cookie: c.client2 })).status).toBe(404)
    // each role reads its own route: a client is refused the staff list, staff the client's
    expect((await call(`/api/jobs/${fernhill}/photos`, { cookie: c.client })).status).toBe(403)
    expect((await call(`/api/client/jobs/${fernhill}/photos`, { cookie: c.finisher })).status).toBe(403)
    const staff = await call(`/api/jobs/${fernhill}/photos`, { cookie: c.finisher })
    expect(staff.data.map((p: { id: string }) => p.id)).toEqual(expect.arrayContaining([hidden.id, shared.id]))
    expect(staff.data.find((p: { id: string }) => p.id === hidden.id)).toMatchObject({ jobId: fernhill, shared: false })
    // sharing it later shows it to the client
    const patched = await call(`/api/photos/${hidden.id}`, { method: 'PATCH', cookie: c.finisher, body: { shared: true, caption: 'Now shared' } })
    expect(patched.data).toMatchObject({ shared: true, caption: 'Now shared' })
    expect((await variant(c.client, hidden.id)).status).toBe(200)
    const bad = await call(`/api/photos/${hidden.id}`, { method: 'PATCH', cookie: c.lead, body: { shared: 'yes' } })
    expect([bad.status, bad.data.data.problems[0].field]).toEqual([422, 'shared'])
    expect((await call('/api/photos/not-a-uuid', { method: 'PATCH', cookie: c.lead, body: { shared: true } })).status).toBe(422)
  })

  it('staff of another workshop get 404 for the photo, its files and its job', async () => {
    const photo = await uploadOne(c.caster, { shared: 'true' })
    const other = await makeOtherWorkshop()
    const otherLead = await signIn(other.lead.email, DEMO_PASSWORD)
    const otherClient = await signIn(other.client.email, DEMO_PASSWORD)
    expect((await variant(otherLead, photo.id)).status).toBe(404)
    expect((await variant(otherClient, photo.id)).status).toBe(404)
    expect((await call(`/api/photos/${photo.id}`, { method: 'PATCH', cookie: otherLead, body: { caption: 'x' } })).status).toBe(404)
    expect((await call(`/api/photos/${photo.id}`, { method: 'DELETE', cookie: otherLead })).status).toBe(404)
    expect((await call(`/api/jobs/${fernhill}/photos`, { cookie: otherLead })).status).toBe(404)
    expect((await upload(otherLead, [{ name: 'a.jpg', data: jpeg }])).status).toBe(404)
  })

  it('the uploader or a lead deletes a photo and its stored files', async () => {
    const mine = await uploadOne(c.caster)
    const keys = await keysOf(mine.id)
    expect((await call(`/api/photos/${mine.id}`, { method: 'DELETE', cookie: c.caster2 })).status).toBe(403)
    expect((await call(`/api/photos/${mine.id}`, { method: 'DELETE', cookie: c.caster })).status).toBe(204)
    expect(existsSync(join(photoDir, keys.thumb_key))).toBe(false)
    expect(existsSync(join(photoDir, keys.display_key))).toBe(false)
    expect((await variant(c.lead, mine.id)).status).toBe(404)
    const theirs = await uploadOne(c.caster2)
    expect((await call(`/api/photos/${theirs.id}`, { method: 'DELETE', cookie: c.lead })).status).toBe(204)
    const stored = new Set(readdirSync(photoDir))
    const rows = await testDb()('photos').select('thumb_key', 'display_key')
    // every stored file belongs to a row: nothing is left behind by refusals or deletions
    expect(stored.size).toBe(rows.length * 2)
  })
})

describe('client progress', () => {
  let fx: Awaited<ReturnType<typeof boardFixture>> | undefined
  // the browser journeys share this database: take our jobs, moulds and bench off the board again
  afterAll(async () => {
    if (!fx) return
    const moulds = fx.k('moulds').where({ bench_id: fx.benchId }).select('id')
    const pours = fx.k('pours').whereIn('mould_id', moulds).select('id')
    await fx.k('pieces').whereIn('pour_id', pours).del()
    await fx.k('pours').whereIn('mould_id', fx.k('moulds').where({ bench_id: fx.benchId }).select('id')).del()
    await fx.k('moulds').where({ bench_id: fx.benchId }).del()
    await fx.k('benches').where({ id: fx.benchId }).del()
    await fx.k('jobs').where('code', 'like', `${fx.tag}-%`).del()
  })
  it('counts planned, cast, fettled, dry and dispatched per item, and gives no date while a piece is unplanned', async () => {
    fx = await boardFixture('progress')
    const ws = fx.workshopId
    const client1 = Number((await fx.k('users').where({ email: demo.client1.email }).first('id')).id)
    const jobId = await fx.job()
    await fx.k('job_members').insert({ workshop_id: ws, job_id: jobId, user_id: client1 })
    const itemId = await fx.item(jobId, null, { pieces_needed: 6 })
    const pours: number[] = []
    for (const hour of [8, 10, 12, 14, 16, 18]) {
      const r = await call('/api/pours', { method: 'POST', cookie: c.lead, body: { mouldId: await fx.mould(), slotStart: `2027-10-04T${String(hour).padStart(2, '0')}:00:00Z`, jobItemId: itemId, casterId: fx.casterId } })
      expect(r.status, JSON.stringify(r.data)).toBe(201)
      pours.push(r.data.id)
    }
    await fx.k('pours').where({ id: pours[5] }).update({ state: 'void' })
    const states = ['to_fettle', 'drying', 'ready', 'packed', 'dispatched']
    for (const [i, state] of states.entries()) {
      await fx.k('pours').where({ id: pours[i] }).update({ state: 'demoulded', result: 'sound' })
      await fx.k('pieces').insert({ workshop_id: ws, pour_id: pours[i], job_item_id: itemId, mark: `${fx.tag}-${i}`, state, dry_mass_kg: 2, wet_mass_kg: 2.5 })
    }
    const r = await call(`/api/client/jobs/${jobId}/progress`, { cookie: c.client })
    expect(r.status).toBe(200)
    expect(r.data.items).toEqual([{ id: itemId, description: expect.any(String), piecesNeeded: 6, planned: 5, cast: 5, fettled: 4, dry: 3, dispatched: 1 }])
    // one of the six pieces has no live pour (the sixth was voided): no date, the count in words instead
    expect(r.data.expectedCompletionAt).toBeNull()
    expect(r.data.completion).toEqual({ kind: 'not_planned', notPlanned: 1, ordered: 6 })
    expect(JSON.stringify(r.data)).not.toMatch(new RegExp(`${fx.casterName}|caster|defect|notes`, 'i'))
    expect((await call(`/api/client/jobs/${jobId}/progress`, { cookie: c.client2 })).status).toBe(404)
    const empty = await fx.job()
    await fx.k('job_members').insert({ workshop_id: ws, job_id: empty, user_id: client1 })
    expect((await call(`/api/client/jobs/${empty}/progress`, { cookie: c.client })).data).toMatchObject({ items: [], expectedCompletionAt: null, photos: [] })
  })
})
