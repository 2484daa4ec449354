// The fixer's pack from the API: one PDF per job with its items wall by wall (the cut list's
// lengths), the pieces with weights and lift marks, the job's fixing notes, the cautions and the
// job's photos, read back with pdf.js (tests/setup/pdf-text.ts); a client cannot fetch it.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { baseUrl, call, signIn } from '../setup/http'
import { DEMO_PASSWORD, closeTestDb, demo } from '../setup/fixtures'
import { finishingFixture } from '../setup/finishing-fixtures'
import { jpegWithGps, photoForm } from '../setup/photo-fixtures'
import { pdfText } from '../setup/pdf-text'

let fx: Awaited<ReturnType<typeof finishingFixture>>
let finisher = ''
let client = ''
beforeAll(async () => {
  fx = await finishingFixture('pack')
  finisher = await signIn(demo.finisher.email, DEMO_PASSWORD)
  client = await signIn(demo.client1.email, DEMO_PASSWORD)
})
afterAll(closeTestDb)
describe('the fixer\'s pack', () => {
  it('lists each item wall by wall with the cut lengths, the pieces with weights and lift marks, the notes, cautions and photos', async () => {
    // a 3 m cast length on the mould (common practice for run cornice lengths, recalled from memory)
    const mouldId = await fx.mould({ cast_length_m: 3 })
    const packJob = await fx.job({ title: 'Morning room', notes: 'Fix on plaster-and-scrim over the wire hangers drawn.' })
    const runItem = await fx.item(packJob, mouldId, { description: 'Morning room cornice', profile: 'Ogee 120', walls: JSON.stringify([{ lengthM: 4.2 }, { lengthM: 2.5 }]), min_piece_m: 0.5 })
    const heavy = await fx.piece({ itemId: runItem, mouldId, slotStart: '2031-08-01T09:00:00Z' })
    await fx.k('pieces').where({ id: heavy.id }).update({ state: 'ready' })
    await fx.k('piece_weighings').insert({ workshop_id: fx.workshopId, piece_id: heavy.id, weighed_kg: 31.5, weighed_at: new Date() })
    const photo = await call(`/api/jobs/${packJob}/photos`, { method: 'POST', cookie: fx.lead, form: photoForm([{ name: 'drawing.jpg', data: await jpegWithGps(120, 80) }], { caption: 'Setting-out drawing' }) })
    expect(photo.status).toBe(201)
    const res = await fetch(`${baseUrl()}/api/jobs/${packJob}/fixers-pack`, { headers: { cookie: finisher } })
    expect(res.status).toBe(200)
    const pages = await pdfText(await res.arrayBuffer())
    const text = pages.join(' ').replace(/\s+/g, ' ')
    for (const s of ['Fixer\'s pack', 'Morning room cornice', 'Ogee 120', 'Wall 1', 'Wall 2', '4.20 m', '2.50 m', heavy.mark, '31.5 kg', 'Two people or a lifting aid',
      'Fix on plaster-and-scrim over the wire hangers drawn.', 'competent person', 'local building codes', 'does not design fixings']) expect(text).toContain(s)
    // the 4.2 m wall takes a full 3 m length and 1.2 m (runCutList: each piece at most the cast length)
    expect(text).toMatch(/3\.00 m, 1\.20 m|1\.20 m, 3\.00 m/)
    // the photo on a page of its own, with its caption
    expect(pages.at(-1)).toContain('Setting-out drawing')
    expect((await fetch(`${baseUrl()}/api/jobs/${packJob}/fixers-pack`, { headers: { cookie: client } })).status).toBe(403)
  })
})
