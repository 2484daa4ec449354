// A dispatch note's pieces as invoice lines (GET /api/dispatches/:id/invoice-lines): one line per
// job item with the pieces dispatched, priced per piece from the client's price of the item that
// the accepted quote carried over (shared/utils/invoice-lines.ts); an item without a price gets a
// line to price by hand. Lead only; another workshop's note is a 404. Figures are our own worked
// example (tests/unit/quote-job.test.ts and tests/unit/invoice-lines.test.ts, by hand there).
import { randomUUID } from 'node:crypto'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { call, signIn } from '../setup/http'
import { QUOTE_RATES, TWO_ROOM_TAKE_OFF } from '../setup/quote-fixtures'
import { DEMO_PASSWORD, closeTestDb, demo, demoWorkshopId, makeOtherWorkshop, testDb } from '../setup/fixtures'

const rates = QUOTE_RATES
const takeOff = TWO_ROOM_TAKE_OFF

let lead = ''
let caster = ''
let ws = 0
let jobId = 0
let items: { id: number; description: string }[] = []
const tag = randomUUID().slice(0, 6)
const k = () => testDb()
const insert = async (table: string, row: Record<string, unknown>) => Number((await k()(table).insert(row).returning('id'))[0].id)

/** `count` pieces of an item, cast on a pour of a mould of their own (planned through the API), put on note `dispatchId`. */
async function dispatched(itemId: number | null, count: number, dispatchId: number, prefix: string) {
  const bench = await insert('benches', { workshop_id: ws, name: `Bench ${prefix}-${tag}`, sort_order: 96 })
  const mould = await insert('moulds', { workshop_id: ws, bench_id: bench, code: `${prefix}-${tag}`, casts: 'Invoice lines', material: 'silicone', cavity_litres: 1, max_dwell_minutes: 240, cavities: count })
  const pour = await call('/api/pours', { method: 'POST', cookie: lead, body: { mouldId: mould, slotStart: '2031-06-02T09:00:00Z' } })
  expect(pour.status, JSON.stringify(pour.data)).toBe(201)
  for (let c = 1; c <= count; c++) {
    await insert('pieces', { workshop_id: ws, pour_id: pour.data.id, cavity: c, job_item_id: itemId, mark: `${prefix}-${tag}-${c}`, state: 'dispatched', dry_mass_kg: 1.2, wet_mass_kg: 1.8, dispatch_id: dispatchId })
  }
}

beforeAll(async () => {
  lead = await signIn(demo.lead.email, DEMO_PASSWORD)
  caster = await signIn(demo.caster1.email, DEMO_PASSWORD)
  const ada = await signIn(demo.client1.email, DEMO_PASSWORD)
  ws = await demoWorkshopId()
  const clientOrgId = Number((await k()('users').whereRaw('lower(email) = lower(?)', [demo.client1.email]).first('client_org_id')).client_org_id)
  const current = await call('/api/rates', { cookie: lead })
  expect((await call('/api/rates', { method: 'PUT', cookie: lead, body: { ...rates, version: current.data.version } })).status).toBe(200)
  const q = (await call('/api/quotes', { method: 'POST', cookie: lead, body: { title: 'Drawing room and hall', clientOrgId, takeOff } })).data
  expect((await call(`/api/quotes/${q.id}/send`, { method: 'POST', cookie: lead, body: { version: q.version } })).status).toBe(200)
  expect((await call(`/api/client/quotes/${q.id}/decision`, { method: 'POST', cookie: ada, body: { revision: 1, decision: 'accept' } })).status).toBe(200)
  const job = await call(`/api/quotes/${q.id}/job`, { method: 'POST', cookie: lead, body: { jobCode: `IL-${tag}`, newSite: { name: `Hall ${tag}`, address: '1 Example Row, Example Town' } } })
  expect(job.status).toBe(201)
  jobId = job.data.jobId
  items = (await call(`/api/jobs/${jobId}`, { cookie: lead })).data.items
})
afterAll(closeTestDb)

describe('a dispatch note\'s invoice lines', () => {
  it('makes one line per item with the pieces dispatched, priced from the quote\'s price of the item', async () => {
    // the items carry the client's price from the accepted quote: £666.14, £58.80, £669.45
    expect((await k()('job_items').where({ job_id: jobId }).orderBy('sort_order').pluck('price_minor')).map(Number)).toEqual([66614, 5880, 66945])
    const [run, , corbel] = items
    // a hand-made item on the same job: no price to go by
    const extra = await call(`/api/jobs/${jobId}/items`, { method: 'POST', cookie: lead, body: { kind: 'pieces', description: 'Patera, by hand', profile: 'Patera', quantity: 1, sortOrder: 10 } })
    expect(extra.status, JSON.stringify(extra.data)).toBe(201)
    const note = await insert('dispatches', { workshop_id: ws, job_id: jobId, note_no: `DN-IL-${tag}`, dispatched_at: new Date() })
    await dispatched(run!.id, 2, note, 'EGG')
    await dispatched(corbel!.id, 4, note, 'CORBEL')
    await dispatched(extra.data.id, 1, note, 'PATERA')

    const r = await call(`/api/dispatches/${note}/invoice-lines`, { cookie: lead })
    expect(r.status, JSON.stringify(r.data)).toBe(200)
    expect(r.data).toMatchObject({ dispatchId: note, noteNo: `DN-IL-${tag}`, jobId, currency: 'GBP' })
    expect(r.data.lines.map((l: { description: string; quantity: number; unitPrice: number | null }) => [l.description, l.quantity, l.unitPrice])).toEqual([
      ['Egg-and-dart 150, Drawing room', 2, 22205], // £666.14 / 3 lengths = £222.05 each
      ['Corbel, Hall', 4, 16736], // £669.45 / 4 = £167.3625 → £167.36
      ['Patera, by hand', 1, null],
    ])
    expect(r.data.lines[1].marks).toEqual([1, 2, 3, 4].map(c => `CORBEL-${tag}-${c}`))

    // the lines as the lead issues them (the patera priced by hand): net £1,143.54, tax £228.71
    const lines = r.data.lines.map((l: { description: string; quantity: number; unitPrice: number | null }) => ({ description: l.description, quantity: l.quantity, unitPrice: l.unitPrice ?? 2500 }))
    const inv = await call(`/api/jobs/${jobId}/invoices`, { method: 'POST', cookie: lead, body: { dispatchId: note, lines } })
    expect(inv.status, JSON.stringify(inv.data)).toBe(201)
    expect(inv.data).toMatchObject({ dispatchNote: `DN-IL-${tag}`, net: 44410 + 66944 + 2500, tax: 22771 })
  })

  it('is the lead\'s: a caster is refused, another workshop\'s note is a 404, a bad id is a 4xx', async () => {
    const note = await insert('dispatches', { workshop_id: ws, job_id: jobId, note_no: `DN-IL2-${tag}`, dispatched_at: new Date() })
    expect((await call(`/api/dispatches/${note}/invoice-lines`, { cookie: caster })).status).toBe(403)
    expect((await call(`/api/dispatches/${note}/invoice-lines`)).status).toBe(401)
    // a note with nothing on it: no lines, nothing made up
    expect((await call(`/api/dispatches/${note}/invoice-lines`, { cookie: lead })).data.lines).toEqual([])

    const other = await makeOtherWorkshop()
    const theirs = await insert('dispatches', { workshop_id: other.workshopId, job_id: other.jobId, note_no: `DN-OTHER-${tag}`, dispatched_at: new Date() })
    const r = await call(`/api/dispatches/${theirs}/invoice-lines`, { cookie: lead })
    expect(r.status).toBe(404)
    expect(JSON.stringify(r.data)).not.toContain('DN-OTHER')
    const bad = await call('/api/dispatches/abc/invoice-lines', { cookie: lead })
    expect(bad.status).toBeGreaterThanOrEqual(400)
    expect(bad.status).toBeLessThan(500)
  })
})
