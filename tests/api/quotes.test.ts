// The office side of a job: the workshop's rates, and quotes priced from a take-off with every
// revision kept. Figures are our own worked example (tests/unit/quote-pricing.test.ts, priced by
// hand there); here they show the route prices with the stored rates and freezes a sent revision.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { call, signIn, baseUrl } from '../setup/http'
import { QUOTE_RATES } from '../setup/quote-fixtures'
import { DEMO_PASSWORD, closeTestDb, demo, testDb } from '../setup/fixtures'
import { pdfText } from '../setup/pdf-text'

let lead = ''
let finisher = ''
let clientOrgId = 0
let ada = ''
let ravi = ''

const rates = QUOTE_RATES
const takeOff = {
  rooms: [
    {
      name: 'Drawing room',
      runs: [{ profile: 'Egg-and-dart 150', walls: [{ lengthM: 5.0 }, { lengthM: 3.1 }], castLengthM: 3, minPieceM: 0.3, sparesPct: 0, plasterKgPerLength: 9, newMould: true }],
      ornaments: [{ name: 'Ceiling centre 600', count: 1, plasterKgEach: 14, newMould: false }],
    },
    { name: 'Hall', runs: [], ornaments: [{ name: 'Corbel', count: 4, plasterKgEach: 3.5, newMould: true }] },
  ],
  bagKg: 25,
  deliveries: 1,
  fixing: true,
}

beforeAll(async () => {
  lead = await signIn(demo.lead.email, DEMO_PASSWORD)
  finisher = await signIn(demo.finisher.email, DEMO_PASSWORD)
  ada = await signIn(demo.client1.email, DEMO_PASSWORD)
  ravi = await signIn(demo.client2.email, DEMO_PASSWORD)
  // ada's organisation: the quotes below are sent to her people, never to ravi's
  clientOrgId = Number((await testDb()('users').whereRaw('lower(email) = lower(?)', [demo.client1.email]).first('client_org_id')).client_org_id)
  const current = await call('/api/rates', { cookie: lead })
  const put = await call('/api/rates', { method: 'PUT', cookie: lead, body: { ...rates, version: current.data.version } })
  expect(put.status).toBe(200)
})
afterAll(closeTestDb)

describe('rates', () => {
  it('are the lead\'s: a finisher gets 403 and a bad figure is named in the user\'s words', async () => {
    expect((await call('/api/rates', { cookie: finisher })).status).toBe(403)
    const v = (await call('/api/rates', { cookie: lead })).data.version
    const bad = await call('/api/rates', { method: 'PUT', cookie: lead, body: { ...rates, castPerLength: 35.5, marginPct: 12.345, currency: 'POUNDS', version: v } })
    expect(bad.status).toBe(422)
    const text = JSON.stringify(bad.data)
    expect(text).toMatch(/Casting per length/)
    expect(text).toMatch(/Margin/)
    expect(text).toMatch(/Currency/)
    expect((await call('/api/rates', { cookie: lead })).data).toMatchObject(rates)
  })
})

describe('quotes', () => {
  it('prices a take-off at the stored rates, numbers it, and keeps the shop\'s estimate', async () => {
    const r = await call('/api/quotes', { method: 'POST', cookie: lead, body: { title: 'Drawing room and hall', clientOrgId, takeOff } })
    expect(r.status).toBe(201)
    expect(r.data.number).toMatch(/^Q-\d{4}$/)
    const rev = r.data.revisions[0]
    expect(rev).toMatchObject({ revision: 1, status: 'draft', currency: 'GBP', net: 157987, tax: 31597, total: 189584, estimate: 137375, deposit: 56875 })
    expect(rev.lines).toHaveLength(9)
    const list = (await call('/api/quotes', { cookie: lead })).data as { id: number; total: number; status: string }[]
    expect(list.find(q => q.id === r.data.id)).toMatchObject({ total: 189584, status: 'draft' })
  })

  it('makes the revision a PDF with the client\'s lines and totals, never the shop\'s estimate', async () => {
    const made = (await call('/api/quotes', { method: 'POST', cookie: lead, body: { title: 'Drawing room and hall', clientOrgId, takeOff } })).data
    const res = await fetch(`${baseUrl()}/api/quotes/${made.id}/pdf`, { headers: { cookie: lead } })
    expect(res.status).toBe(200)
    expect(res.headers.get('content-type')).toBe('application/pdf')
    const text = (await pdfText(await res.arrayBuffer())).join(' ')
    expect(text).toContain(`Quote ${made.number}, revision 1`)
    expect(text).toContain('Egg-and-dart 150, Drawing room')
    expect(text).toContain('£1,895.84') // the worked example's total
    expect(text).toContain('£568.75') // its deposit, 30 %
    expect(text).toContain('DRAFT')
    expect(text).toMatch(/competent people/) // fixing on site: the usual caution
    expect(text).not.toContain('£1,373.75') // the estimate stays in the shop
    expect((await fetch(`${baseUrl()}/api/quotes/${made.id}/pdf?revision=7`, { headers: { cookie: lead } })).status).toBe(404)
    expect((await fetch(`${baseUrl()}/api/quotes/${made.id}/pdf`, { headers: { cookie: finisher } })).status).toBe(403)
  })

  it('reprices a draft when edited, freezes it once sent, and makes a new revision for a change', async () => {
    const made = (await call('/api/quotes', { method: 'POST', cookie: lead, body: { title: 'Hall only', clientOrgId, takeOff } })).data
    const fewer = { ...takeOff, deliveries: 0, fixing: false }
    const edited = await call(`/api/quotes/${made.id}`, { method: 'PATCH', cookie: lead, body: { takeOff: fewer, version: made.version } })
    expect(edited.status).toBe(200)
    expect(edited.data.revisions[0].net).toBe(157987 - 11648 - 6900)

    const sent = await call(`/api/quotes/${made.id}/send`, { method: 'POST', cookie: lead, body: { version: edited.data.version } })
    expect(sent.status).toBe(200)
    expect(sent.data.revisions[0].status).toBe('sent')
    expect(sent.data.revisions[0].sentAt).not.toBeNull()

    // a sent revision is never edited
    const refused = await call(`/api/quotes/${made.id}`, { method: 'PATCH', cookie: lead, body: { takeOff, version: sent.data.version } })
    expect(refused.status).toBe(409)
    expect(refused.data.message).toMatch(/never edited/)
    const after = (await call(`/api/quotes/${made.id}`, { cookie: lead })).data
    expect(after.revisions[0].net).toBe(157987 - 11648 - 6900)

    const revised = await call(`/api/quotes/${made.id}/revise`, { method: 'POST', cookie: lead, body: { version: after.version } })
    expect(revised.status).toBe(200)
    expect(revised.data.revisions.map((r: { revision: number; status: string }) => [r.revision, r.status])).toEqual([[1, 'superseded'], [2, 'draft']])
    const v2 = await call(`/api/quotes/${made.id}`, { method: 'PATCH', cookie: lead, body: { takeOff, version: revised.data.version } })
    expect(v2.data.revisions[1].net).toBe(157987)
    expect(v2.data.revisions[0].net).toBe(157987 - 11648 - 6900)
  })

  it('numbers quotes made at the same moment one after another, never the same number twice', async () => {
    const made = await Promise.all(Array.from({ length: 5 }, (_, i) => call('/api/quotes', { method: 'POST', cookie: lead, body: { title: `At once ${i}`, takeOff } })))
    expect(made.map(r => r.status)).toEqual([201, 201, 201, 201, 201])
    expect(new Set(made.map(r => r.data.number)).size).toBe(5)
  })

  it('will not send a quote without a client, and a stale version is a conflict', async () => {
    const made = (await call('/api/quotes', { method: 'POST', cookie: lead, body: { title: 'No client yet', takeOff } })).data
    const r = await call(`/api/quotes/${made.id}/send`, { method: 'POST', cookie: lead, body: { version: made.version } })
    expect(r.status).toBe(422)
    expect(JSON.stringify(r.data)).toMatch(/Choose the client/)
    const named = await call(`/api/quotes/${made.id}`, { method: 'PATCH', cookie: lead, body: { clientOrgId, version: made.version } })
    expect(named.status).toBe(200)
    expect((await call(`/api/quotes/${made.id}/send`, { method: 'POST', cookie: lead, body: { version: made.version } })).status).toBe(409)
  })

  it('refuses another workshop\'s client and names the bad take-off field', async () => {
    const k = testDb()
    const [ws] = await k('workshops').insert({ name: 'Elsewhere quotes' }).returning('id')
    const [org] = await k('client_orgs').insert({ workshop_id: ws.id, name: 'Not ours' }).returning('id')
    const r = await call('/api/quotes', { method: 'POST', cookie: lead, body: { title: 'x', clientOrgId: Number(org.id), takeOff } })
    expect(r.status).toBe(422)
    expect(JSON.stringify(r.data)).toMatch(/Client/)
    const bad = structuredClone(takeOff)
    bad.rooms[1]!.ornaments[0]!.count = 0
    const b = await call('/api/quotes', { method: 'POST', cookie: lead, body: { title: 'x', takeOff: bad } })
    expect(b.status).toBe(422)
    expect(JSON.stringify(b.data)).toMatch(/count/i)
  })
})

describe('the client\'s side of a quote', () => {
  it('shows a sent revision to its organisation only, without the estimate, and mails its people', async () => {
    const made = (await call('/api/quotes', { method: 'POST', cookie: lead, body: { title: 'Client side', clientOrgId, takeOff } })).data
    // a draft is not the client's to see
    expect((await call(`/api/client/quotes/${made.id}`, { cookie: ada })).status).toBe(404)
    const sent = await call(`/api/quotes/${made.id}/send`, { method: 'POST', cookie: lead, body: { version: made.version } })
    expect(sent.status).toBe(200)
    const mine = await call(`/api/client/quotes/${made.id}`, { cookie: ada })
    expect(mine.status).toBe(200)
    expect(mine.data).toMatchObject({ number: made.number, revision: 1, status: 'sent', total: 189584, deposit: 56875 })
    expect(JSON.stringify(mine.data)).not.toMatch(/estimate/)
    expect((await call('/api/client/quotes', { cookie: ada })).data.map((q: { id: number }) => q.id)).toContain(made.id)
    // another organisation's client sees nothing of it
    expect((await call(`/api/client/quotes/${made.id}`, { cookie: ravi })).status).toBe(404)
    expect((await call('/api/client/quotes', { cookie: ravi })).data.map((q: { id: number }) => q.id)).not.toContain(made.id)
    const pdf = await fetch(`${baseUrl()}/api/client/quotes/${made.id}/pdf`, { headers: { cookie: ada } })
    expect(pdf.status).toBe(200)
    const text = (await pdfText(await pdf.arrayBuffer())).join(' ')
    expect(text).toContain('£1,895.84')
    expect(text).not.toContain('DRAFT')
    const mails = await testDb()('mail_outbox').where({ kind: 'quote_sent' }).andWhere('dedupe_key', 'like', `quote-sent:${made.id}:1:%`).select('to_email')
    expect(mails.map(m => m.to_email.toLowerCase())).toContain(demo.client1.email.toLowerCase())
    expect(mails.map(m => m.to_email.toLowerCase())).not.toContain(demo.client2.email.toLowerCase())
  })

  it('takes changes with a comment, then accepts exactly the revision read', async () => {
    const made = (await call('/api/quotes', { method: 'POST', cookie: lead, body: { title: 'Decide', clientOrgId, takeOff } })).data
    const sent = (await call(`/api/quotes/${made.id}/send`, { method: 'POST', cookie: lead, body: { version: made.version } })).data
    const decide = (cookie: string, body: unknown) => call(`/api/client/quotes/${made.id}/decision`, { method: 'POST', cookie, body })

    const silent = await decide(ada, { revision: 1, decision: 'changes' })
    expect(silent.status).toBe(422)
    expect(JSON.stringify(silent.data)).toMatch(/Say what you would like changed/)
    expect((await decide(ravi, { revision: 1, decision: 'accept' })).status).toBe(404)
    expect((await decide(lead, { revision: 1, decision: 'accept' })).status).toBe(403)

    const changes = await decide(ada, { revision: 1, decision: 'changes', comment: 'Leave out the fixing, our builder fixes.' })
    expect(changes.status).toBe(200)
    expect(changes.data).toMatchObject({ status: 'changes_requested', decisionComment: 'Leave out the fixing, our builder fixes.' })
    const told = await testDb()('mail_outbox').where({ kind: 'quote_decision' }).andWhere('dedupe_key', 'like', `quote-decision:${made.id}:1:%`).first('subject')
    expect(told.subject).toMatch(/asked for changes to revision 1/)

    // the lead makes revision 2 without fixing and sends it
    const revised = (await call(`/api/quotes/${made.id}/revise`, { method: 'POST', cookie: lead, body: { version: sent.version } })).data
    const edited = (await call(`/api/quotes/${made.id}`, { method: 'PATCH', cookie: lead, body: { takeOff: { ...takeOff, fixing: false }, version: revised.version } })).data
    expect((await call(`/api/quotes/${made.id}/send`, { method: 'POST', cookie: lead, body: { version: edited.version } })).status).toBe(200)

    // accepting the revision read before is refused: the client must read revision 2
    const stale = await decide(ada, { revision: 1, decision: 'accept' })
    expect(stale.status).toBe(409)
    expect(stale.data.message).toMatch(/read revision 2/)
    const accepted = await decide(ada, { revision: 2, decision: 'accept' })
    expect(accepted.status).toBe(200)
    expect(accepted.data).toMatchObject({ revision: 2, status: 'accepted' })
    expect(accepted.data.earlier).toEqual([expect.objectContaining({ revision: 1, status: 'changes_requested' })])
    expect((await decide(ada, { revision: 2, decision: 'accept' })).status).toBe(409)
    // an accepted quote is not revised
    const lead2 = (await call(`/api/quotes/${made.id}`, { cookie: lead })).data
    expect((await call(`/api/quotes/${made.id}/revise`, { method: 'POST', cookie: lead, body: { version: lead2.version } })).status).toBe(409)
  })
})
