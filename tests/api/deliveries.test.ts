// Crates, deliveries, the proof of delivery and calendar feeds from the API: packing with
// weights summed and the heaviest-crate warning, a delivery refused with the marks of the pieces
// not ready, the client's mail and portal, the signed note as a PDF, a broken piece going back
// to the planner, and the ICS feed's content, revocation and tenancy. Pieces are made through the
// floor API (tests/setup/finishing-fixtures.ts) and then stood in the state a test needs.
import { createHash, randomUUID } from 'node:crypto'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { baseUrl, call, signIn } from '../setup/http'
import { DEMO_PASSWORD, closeTestDb, demo, makeOtherWorkshop } from '../setup/fixtures'
import { finishingFixture } from '../setup/finishing-fixtures'
import { jpegWithGps, photoForm } from '../setup/photo-fixtures'
import { pdfText } from '../setup/pdf-text'

let fx: Awaited<ReturnType<typeof finishingFixture>>
let finisher = ''
let client = ''
let jobId = 0
let itemId = 0
let jobCode = ''
const contactEmail = `deliveries-${randomUUID().slice(0, 6)}@contact.example.test`
/** A one-pixel PNG as the signature pad sends it (a data URL). */
const SIGNATURE = 'data:image/png;base64,iVBORw0KGgoAAAANSUhEUgAAAAEAAAABCAYAAAAfFcSJAAAADUlEQVR42mNkYPhfDwAChwGA60e6kgAAAABJRU5ErkJggg=='

beforeAll(async () => {
  fx = await finishingFixture('deliv')
  finisher = await signIn(demo.finisher.email, DEMO_PASSWORD)
  client = await signIn(demo.client1.email, DEMO_PASSWORD)
  const ada = await fx.k('users').where({ email: demo.client1.email }).first('id', 'client_org_id')
  const orgId = Number(ada.client_org_id)
  const [site] = await fx.k('client_sites').insert({ workshop_id: fx.workshopId, client_org_id: orgId, name: `Site ${fx.tag}`, address: '4 Quarry Lane', postcode: 'EX1 2AB' }).returning('id')
  jobId = await fx.job({ client_org_id: orgId, site_id: Number(site.id) })
  jobCode = (await fx.k('jobs').where({ id: jobId }).first('code')).code
  await fx.k('job_members').insert({ workshop_id: fx.workshopId, job_id: jobId, user_id: ada.id })
  await fx.k('client_contacts').insert({ workshop_id: fx.workshopId, client_org_id: orgId, name: 'Delivery contact', email: contactEmail })
  itemId = await fx.item(jobId, null)
})
afterAll(closeTestDb)

/** A piece of the test's job, stood in `state` (the finishing steps have tests of their own). */
async function piece(state: 'drying' | 'to_fettle' | 'ready' | 'packed', slot: number) {
  const p = await fx.piece({ itemId, slotStart: `2031-04-${String(slot).padStart(2, '0')}T09:00:00Z` })
  await fx.k('pieces').where({ id: p.id }).update({ state })
  return p
}
let slot = 1
const next = (state: Parameters<typeof piece>[0]) => piece(state, slot++)

describe('crates', () => {
  it('packs ready pieces into a numbered crate, sums their weights and warns over the heaviest crate', async () => {
    const [a, b] = [await next('ready'), await next('packed')]
    const r = await call(`/api/jobs/${jobId}/crates`, { method: 'POST', cookie: finisher, body: { pieceIds: [a.id, b.id] } })
    expect(r.status, JSON.stringify(r.data)).toBe(201)
    expect(r.data.label).toMatch(/^C\d+$/)
    // handling weight: no weighing, so the computed dry mass the demould stored
    expect(r.data.totalKg).toBeCloseTo(a.dryMassKg + b.dryMassKg, 3)
    expect(r.data.pieces.map((p: { mark: string }) => p.mark).sort()).toEqual([a.mark, b.mark].sort())
    expect(r.data.overWeight).toBe(false)
    expect((await fx.k('pieces').where({ id: a.id }).first()).state).toBe('packed')
    const ev = await fx.k('events').where({ entity: 'piece', entity_id: String(a.id), type: 'piece.packed' }).first()
    expect(ev.data).toMatchObject({ from: 'ready', to: 'packed', crate: r.data.label })

    await fx.k('workshops').where({ id: fx.workshopId }).update({ crate_max_kg: a.dryMassKg + b.dryMassKg + 0.001 })
    const c = await next('ready')
    const more = await call(`/api/crates/${r.data.id}/pieces`, { method: 'POST', cookie: finisher, body: { pieceIds: [c.id] } })
    await fx.k('workshops').where({ id: fx.workshopId }).update({ crate_max_kg: 250 })
    expect(more.status).toBe(200)
    expect(more.data.totalKg).toBeCloseTo(a.dryMassKg + b.dryMassKg + c.dryMassKg, 3)
    expect(more.data.overWeight).toBe(true)
    const label = await call(`/api/crates/${r.data.id}`, { cookie: finisher })
    expect(label.data).toMatchObject({ job: { code: jobCode, site: `Site ${fx.tag}` }, crate: { label: r.data.label } })
  })

  it('flags a crate over the heaviest crate the lead sets in the workshop settings, on the packing screen and the crate label', async () => {
    const [a, b] = [await next('ready'), await next('ready')]
    // cast heavier than the fixture's pours, so two of them pass a limit the settings accept (10 kg at least)
    await fx.k('pieces').whereIn('id', [a.id, b.id]).update({ dry_mass_kg: 7.25, wet_mass_kg: 8.5 })
    const settings = (await call('/api/workshop', { cookie: fx.lead })).data
    const set = await call('/api/workshop', { method: 'PATCH', cookie: fx.lead, body: { ...settings, crateMaxKg: 14 } })
    expect(set.status, JSON.stringify(set.data)).toBe(200)
    try {
      const crate = await call(`/api/jobs/${jobId}/crates`, { method: 'POST', cookie: finisher, body: { pieceIds: [a.id, b.id] } })
      expect(crate.status).toBe(201)
      expect(crate.data).toMatchObject({ totalKg: 14.5, overWeight: true })
      const screen = await call(`/api/jobs/${jobId}/crates`, { cookie: fx.lead })
      expect(screen.data.crateMaxKg).toBe(14)
      expect(screen.data.crates.find((c: { id: number }) => c.id === crate.data.id).overWeight).toBe(true)
      expect((await call(`/api/crates/${crate.data.id}`, { cookie: finisher })).data).toMatchObject({ crateMaxKg: 14, crate: { overWeight: true } })
      // raised past its weight, the same crate is no longer flagged
      const raised = await call('/api/workshop', { method: 'PATCH', cookie: fx.lead, body: { ...set.data, crateMaxKg: 14.5 } })
      expect(raised.status).toBe(200)
      expect((await call(`/api/crates/${crate.data.id}`, { cookie: finisher })).data).toMatchObject({ crateMaxKg: 14.5, crate: { overWeight: false } })
    }
    finally {
      const now = (await call('/api/workshop', { cookie: fx.lead })).data
      await call('/api/workshop', { method: 'PATCH', cookie: fx.lead, body: { ...now, crateMaxKg: 250 } })
    }
  })

  it('refuses a piece that is not ready, naming it, and packs nothing', async () => {
    const [ok, wet] = [await next('ready'), await next('drying')]
    const r = await call(`/api/jobs/${jobId}/crates`, { method: 'POST', cookie: finisher, body: { pieceIds: [ok.id, wet.id] } })
    expect(r.status).toBe(422)
    expect(JSON.stringify(r.data)).toContain(`${wet.mark} (drying)`)
    expect(JSON.stringify(r.data)).not.toContain(ok.mark)
    expect(await fx.k('crate_pieces').whereIn('piece_id', [ok.id, wet.id])).toHaveLength(0)
    expect((await fx.k('pieces').where({ id: ok.id }).first()).state).toBe('ready')
  })

  it('keeps another workshop out of the crates', async () => {
    const other = await makeOtherWorkshop()
    const otherLead = await signIn(other.lead.email, DEMO_PASSWORD)
    const crate = (await call(`/api/jobs/${jobId}/crates`, { method: 'POST', cookie: finisher, body: {} })).data
    expect((await call(`/api/crates/${crate.id}`, { cookie: otherLead })).status).toBe(404)
    expect((await call(`/api/jobs/${jobId}/crates`, { cookie: otherLead })).status).toBe(404)
  })
})

describe('deliveries and the proof of delivery', () => {
  it('refuses a delivery of pieces not yet ready, naming every mark, and books nothing', async () => {
    const packed = await next('packed')
    const crate = (await call(`/api/jobs/${jobId}/crates`, { method: 'POST', cookie: finisher, body: { pieceIds: [packed.id] } })).data
    const [wet, raw] = [await next('drying'), await next('to_fettle')]
    const r = await call(`/api/jobs/${jobId}/deliveries`, { method: 'POST', cookie: fx.lead, body: { deliveryDay: '2031-05-02', vehicle: 'Van 2', crateIds: [crate.id], pieceIds: [wet.id, raw.id] } })
    expect(r.status).toBe(422)
    const words = JSON.stringify(r.data)
    expect(words).toContain(`${wet.mark} (drying)`)
    expect(words).toContain(`${raw.mark} (to fettle)`)
    expect(words).not.toContain(packed.mark)
    expect(await fx.k('deliveries').where({ job_id: jobId })).toHaveLength(0)
    expect((await fx.k('crates').where({ id: crate.id }).first()).delivery_id).toBeNull()
  })

  it('books crates and a loose length, tells the client\'s contacts, signs for it with a broken piece sent back to the planner', async () => {
    const [a, b, loose] = [await next('packed'), await next('packed'), await next('packed')]
    const crate = (await call(`/api/jobs/${jobId}/crates`, { method: 'POST', cookie: finisher, body: { pieceIds: [a.id, b.id] } })).data
    const booked = await call(`/api/jobs/${jobId}/deliveries`, { method: 'POST', cookie: fx.lead, body: { deliveryDay: '2031-05-06', fixingOn: '2031-05-07', vehicle: 'Flatbed 1', crateIds: [crate.id], pieceIds: [loose.id] } })
    expect(booked.status, JSON.stringify(booked.data)).toBe(201)
    expect(booked.data).toMatchObject({ pieces: 3, overWeight: [] })
    expect(booked.data.totalKg).toBeCloseTo(a.dryMassKg + b.dryMassKg + loose.dryMassKg, 3)
    const mail = await fx.k('mail_outbox').where({ to_email: contactEmail, kind: 'delivery' }).first()
    expect(mail.subject).toContain(jobCode)
    expect(mail.text).toContain('Flatbed 1')
    // a booked crate takes no more pieces
    const extra = await next('ready')
    expect((await call(`/api/crates/${crate.id}/pieces`, { method: 'POST', cookie: finisher, body: { pieceIds: [extra.id] } })).status).toBe(409)

    const portal = await call(`/api/client/jobs/${jobId}/deliveries`, { cookie: client })
    expect(portal.data).toEqual([expect.objectContaining({ id: booked.data.id, state: 'booked', pieces: 3, deliveryDay: '2031-05-06', site: `Site ${fx.tag}` })])

    const photo = await call(`/api/jobs/${jobId}/photos`, { method: 'POST', cookie: finisher, form: photoForm([{ name: 'load.jpg', data: await jpegWithGps(64, 48) }]) })
    expect(photo.status, JSON.stringify(photo.data)).toBe(201)
    const progress = async () => (await call(`/api/client/jobs/${jobId}/progress`, { cookie: client })).data.items.find((i: { id: number }) => i.id === itemId)
    const before = await progress()
    const body = { actionId: randomUUID(), receiverName: 'Petra Site-Manager', signature: SIGNATURE, photoId: photo.data[0].id, broken: [{ pieceId: b.id, note: 'corner snapped' }] }
    const signed = await call(`/api/deliveries/${booked.data.id}/proof`, { method: 'POST', cookie: finisher, body })
    expect(signed.status, JSON.stringify(signed.data)).toBe(200)
    expect(signed.data).toMatchObject({ delivered: 2, broken: [b.mark] })
    const replay = await call(`/api/deliveries/${booked.data.id}/proof`, { method: 'POST', cookie: finisher, body })
    expect(replay.data).toEqual(signed.data)
    expect(replay.headers.get('x-setline-replayed')).toBe('1')

    expect((await fx.k('pieces').whereIn('id', [a.id, loose.id]).select('state')).map(p => p.state)).toEqual(['dispatched', 'dispatched'])
    const broken = await fx.k('pieces').where({ id: b.id }).first()
    expect(broken).toMatchObject({ state: 'rejected', reason: 'Broken on delivery: corner snapped' })
    // like a finisher's rejected piece, its pour no longer counts as cast: the planner casts it again
    expect(await progress()).toMatchObject({ cast: before.cast - 1, dispatched: before.dispatched + 2 })
    expect(await fx.k('mail_outbox').where({ to_email: contactEmail, kind: 'delivery' }).whereLike('subject', 'Delivered%')).toHaveLength(1)

    const seen = await call(`/api/client/jobs/${jobId}/deliveries`, { cookie: client })
    expect(seen.data[0]).toMatchObject({ state: 'delivered', broken: 1, receiverName: 'Petra Site-Manager' })
    const pdf = await fetch(`${baseUrl()}/api/client/deliveries/${booked.data.id}/note`, { headers: { cookie: client } })
    expect(pdf.status).toBe(200)
    expect(pdf.headers.get('content-type')).toBe('application/pdf')
    // a long mark wraps inside its column, so the words are compared without their spaces
    const text = (await pdfText(await pdf.arrayBuffer())).join(' ').replace(/\s+/g, '')
    for (const s of [jobCode, a.mark, b.mark, loose.mark, 'Broken: corner snapped', 'Received by: Petra Site-Manager', 'Flatbed 1', '4 Quarry Lane']) expect(text).toContain(s.replace(/\s+/g, ''))
    const ravi = await signIn(demo.client2.email, DEMO_PASSWORD)
    expect((await fetch(`${baseUrl()}/api/client/deliveries/${booked.data.id}/note`, { headers: { cookie: ravi } })).status).toBe(404)
    // signed once: a second proof is refused
    expect((await call(`/api/deliveries/${booked.data.id}/proof`, { method: 'POST', cookie: finisher, body: { ...body, actionId: randomUUID() } })).status).toBe(409)
  })

  it('refuses a signature that is not a PNG from the pad, naming the field in the form\'s words', async () => {
    const p = await next('packed')
    const booked = await call(`/api/jobs/${jobId}/deliveries`, { method: 'POST', cookie: fx.lead, body: { deliveryDay: '2031-05-09', vehicle: 'Van 1', pieceIds: [p.id] } })
    const r = await call(`/api/deliveries/${booked.data.id}/proof`, { method: 'POST', cookie: finisher, body: { actionId: randomUUID(), receiverName: 'X', signature: 'data:image/png;base64,AAAA' } })
    expect(r.status).toBe(422)
    expect(JSON.stringify(r.data)).toContain('Signature')
    expect((await fx.k('deliveries').where({ id: booked.data.id }).first()).state).toBe('booked')
  })
  it('refuses crates and loose pieces of another job and an empty crate, naming each in the form\'s words, and a crate booked twice', async () => {
    const otherJob = await fx.job()
    const otherItem = await fx.item(otherJob, null)
    const [theirs, stray, ours] = [await next('ready'), await next('packed'), await next('packed')]
    await fx.k('pieces').whereIn('id', [theirs.id, stray.id]).update({ job_item_id: otherItem })
    const theirCrate = (await call(`/api/jobs/${otherJob}/crates`, { method: 'POST', cookie: finisher, body: { pieceIds: [theirs.id] } })).data
    const empty = (await call(`/api/jobs/${jobId}/crates`, { method: 'POST', cookie: finisher, body: {} })).data
    const full = (await call(`/api/jobs/${jobId}/crates`, { method: 'POST', cookie: finisher, body: { pieceIds: [ours.id] } })).data
    const book = (body: Record<string, unknown>) => call(`/api/jobs/${jobId}/deliveries`, { method: 'POST', cookie: fx.lead, body: { deliveryDay: '2031-05-12', vehicle: 'Van 5', ...body } })
    const refused = async (body: Record<string, unknown>) => {
      const r = await book(body)
      expect(r.status, JSON.stringify(r.data)).toBe(422)
      return r.data.data.problems
    }
    // crates are named by the label on them (C1…), never by an id
    expect(await refused({ crateIds: [theirCrate.id] })).toEqual([{ field: 'crateIds', message: `Crates of another job than ${jobCode}: ${theirCrate.label}` }])
    expect(await refused({ pieceIds: [stray.id] })).toEqual([{ field: 'pieceIds', message: `Pieces of another job than ${jobCode}: ${stray.mark}` }])
    expect(await refused({ crateIds: [empty.id] })).toEqual([{ field: 'crateIds', message: `Crates with nothing packed in them cannot be delivered: ${empty.label}` }])
    expect(await fx.k('deliveries').where({ job_id: jobId, vehicle: 'Van 5' })).toHaveLength(0)
    // packing another job's piece into this job's crate is refused the same way
    const packed = await call(`/api/crates/${full.id}/pieces`, { method: 'POST', cookie: finisher, body: { pieceIds: [stray.id] } })
    expect(packed.data.data.problems).toEqual([{ field: 'pieceIds', message: `Pieces of another job: ${stray.mark}` }])

    expect((await book({ crateIds: [full.id] })).status).toBe(201)
    const twice = await book({ crateIds: [full.id] })
    expect(twice.status).toBe(409)
    expect(twice.data.message).toBe(`Already on a delivery: ${full.label}`)
    expect(await fx.k('deliveries').where({ job_id: jobId, vehicle: 'Van 5' })).toHaveLength(1)
  })

  it('refuses a proof with a photo of another job or a broken piece not on the delivery, in the form\'s words, and signs nothing', async () => {
    const [p, elsewhere] = [await next('packed'), await next('packed')]
    const booked = await call(`/api/jobs/${jobId}/deliveries`, { method: 'POST', cookie: fx.lead, body: { deliveryDay: '2031-05-14', vehicle: 'Van 6', pieceIds: [p.id] } })
    expect(booked.status).toBe(201)
    const photo = await call(`/api/jobs/${await fx.job()}/photos`, { method: 'POST', cookie: finisher, form: photoForm([{ name: 'elsewhere.jpg', data: await jpegWithGps(64, 48) }]) })
    expect(photo.status).toBe(201)
    const sign = (extra: Record<string, unknown>) => call(`/api/deliveries/${booked.data.id}/proof`, { method: 'POST', cookie: finisher, body: { actionId: randomUUID(), receiverName: 'Petra Site-Manager', signature: SIGNATURE, ...extra } })
    const wrongPhoto = await sign({ photoId: photo.data[0].id })
    expect(wrongPhoto.status).toBe(422)
    expect(wrongPhoto.data.data.problems).toEqual([{ field: 'photoId', message: 'Photo must be a photo of this job' }])
    const wrongPiece = await sign({ broken: [{ pieceId: elsewhere.id, note: 'cracked in the yard' }] })
    expect(wrongPiece.status).toBe(422)
    expect(wrongPiece.data.data.problems).toEqual([{ field: 'broken', message: 'Broken pieces may only list pieces on this delivery' }])
    expect((await fx.k('deliveries').where({ id: booked.data.id }).first()).state).toBe('booked')
    expect((await fx.k('pieces').whereIn('id', [p.id, elsewhere.id]).select('state')).map(r => r.state)).toEqual(['packed', 'packed'])
  })
})

describe('calendar feeds', () => {
  it('serves the deliveries and fixing days behind a secret link, per workshop and per job, and 404s once revoked', async () => {
    const p = await next('packed')
    const booked = await call(`/api/jobs/${jobId}/deliveries`, { method: 'POST', cookie: fx.lead, body: { deliveryDay: '2031-06-03', fixingOn: '2031-06-04', vehicle: 'Van 3', pieceIds: [p.id] } })
    expect(booked.status).toBe(201)
    const otherJob = await fx.job()
    const q = await next('packed')
    const otherItem = await fx.item(otherJob, null)
    await fx.k('pieces').where({ id: q.id }).update({ job_item_id: otherItem })
    const otherCode = (await fx.k('jobs').where({ id: otherJob }).first('code')).code
    expect((await call(`/api/jobs/${otherJob}/deliveries`, { method: 'POST', cookie: fx.lead, body: { deliveryDay: '2031-06-10', vehicle: 'Van 4', pieceIds: [q.id] } })).status).toBe(201)

    const all = await call('/api/feeds', { method: 'POST', cookie: fx.lead, body: {} })
    const one = await call('/api/feeds', { method: 'POST', cookie: fx.lead, body: { jobId } })
    expect(all.status).toBe(201)
    expect(all.data.url).toMatch(/\/api\/ics\/[\w-]{40,}\.ics$/)
    const path = (u: string) => new URL(u).pathname
    const feed = await fetch(`${baseUrl()}${path(all.data.url)}`)
    expect(feed.status).toBe(200)
    expect(feed.headers.get('content-type')).toContain('text/calendar')
    const ics = await feed.text()
    expect(ics).toContain('BEGIN:VCALENDAR')
    expect(ics).toContain('DTSTART;VALUE=DATE:20310603')
    expect(ics).toContain('DTSTART;VALUE=DATE:20310604')
    expect(ics).toContain(`Delivery ${jobCode}`)
    expect(ics).toContain(`Fixing ${jobCode}`)
    expect(ics).toContain(otherCode)
    const jobIcs = await (await fetch(`${baseUrl()}${path(one.data.url)}`)).text()
    expect(jobIcs).toContain(`Delivery ${jobCode}`)
    expect(jobIcs).not.toContain(otherCode)
    // the list never shows a secret
    expect(JSON.stringify((await call('/api/feeds', { cookie: fx.lead })).data)).not.toContain(path(all.data.url).split('/').pop()!.replace('.ics', ''))

    expect((await call(`/api/feeds/${all.data.id}`, { method: 'DELETE', cookie: fx.lead })).data.revokedAt).toBeTruthy()
    expect((await fetch(`${baseUrl()}${path(all.data.url)}`)).status).toBe(404)
    expect((await fetch(`${baseUrl()}${path(one.data.url)}`)).status).toBe(200)
    expect((await call('/api/feeds', { method: 'POST', cookie: finisher, body: {} })).status).toBe(403)
  })

  it('shows another workshop\'s link nothing of ours', async () => {
    const other = await makeOtherWorkshop()
    const token = `other-${randomUUID()}-${randomUUID()}`
    await fx.k('calendar_feeds').insert({ workshop_id: other.workshopId, token_hash: createHash('sha256').update(token).digest('hex') })
    const r = await fetch(`${baseUrl()}/api/ics/${token}.ics`)
    expect(r.status).toBe(200)
    const ics = await r.text()
    expect(ics).toContain('BEGIN:VCALENDAR')
    expect(ics).not.toContain(jobCode)
    expect(ics).not.toContain('VEVENT')
    expect((await call(`/api/feeds/${(await fx.k('calendar_feeds').where({ workshop_id: other.workshopId }).first('id')).id}`, { method: 'DELETE', cookie: fx.lead })).status).toBe(404)
  })
})
