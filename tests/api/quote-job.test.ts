// An accepted quote becomes a job in one step: the client's job at a site of theirs, one item per
// run and ornament with the shop's estimate for it, the quote's deposit asked, the client's people
// made members. A quote not accepted, or made into a job already, is refused in words. Figures are
// our own worked example (tests/unit/quote-job.test.ts, split by hand there).
import { randomUUID } from 'node:crypto'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { call, signIn } from '../setup/http'
import { QUOTE_RATES, TWO_ROOM_TAKE_OFF } from '../setup/quote-fixtures'
import { DEMO_PASSWORD, closeTestDb, demo, testDb } from '../setup/fixtures'

let lead = ''
let ada = ''
let ravi = ''
let clientOrgId = 0

const rates = QUOTE_RATES
const takeOff = TWO_ROOM_TAKE_OFF
const code = () => `QJ-${randomUUID().slice(0, 6)}`

/** A quote for ada's organisation, sent, and (unless `accept` is false) accepted by ada. */
async function quote(accept = true) {
  const made = (await call('/api/quotes', { method: 'POST', cookie: lead, body: { title: 'Drawing room and hall', clientOrgId, takeOff } })).data
  expect((await call(`/api/quotes/${made.id}/send`, { method: 'POST', cookie: lead, body: { version: made.version } })).status).toBe(200)
  if (accept) expect((await call(`/api/client/quotes/${made.id}/decision`, { method: 'POST', cookie: ada, body: { revision: 1, decision: 'accept' } })).status).toBe(200)
  return made.id as number
}

beforeAll(async () => {
  lead = await signIn(demo.lead.email, DEMO_PASSWORD)
  ada = await signIn(demo.client1.email, DEMO_PASSWORD)
  ravi = await signIn(demo.client2.email, DEMO_PASSWORD)
  clientOrgId = Number((await testDb()('users').whereRaw('lower(email) = lower(?)', [demo.client1.email]).first('client_org_id')).client_org_id)
  const current = await call('/api/rates', { cookie: lead })
  expect((await call('/api/rates', { method: 'PUT', cookie: lead, body: { ...rates, version: current.data.version } })).status).toBe(200)
})
afterAll(closeTestDb)

describe('an accepted quote becomes a job', () => {
  it('makes the job, its items with their estimates, its deposit and its site in one step', async () => {
    const id = await quote()
    const jobCode = code()
    const r = await call(`/api/quotes/${id}/job`, { method: 'POST', cookie: lead, body: { jobCode, newSite: { name: `Hall ${jobCode}`, address: '1 Example Row, Example Town' } } })
    expect(r.status).toBe(201)
    expect(r.data).toMatchObject({ quoteId: id, items: 3, depositMinor: 56875 })
    expect(r.data.job).toMatchObject({ code: jobCode, title: 'Drawing room and hall', clientOrgId, site: `Hall ${jobCode}` })

    const job = (await call(`/api/jobs/${r.data.jobId}`, { cookie: lead })).data
    expect(job.items.map((i: { description: string; piecesNeeded: number; quantity: number | null }) => [i.description, i.piecesNeeded, i.quantity])).toEqual([
      ['Egg-and-dart 150, Drawing room', 3, null],
      ['Ceiling centre 600, Drawing room', 1, 1],
      ['Corbel, Hall', 4, 4],
    ])
    // the run keeps its walls with the corner the take-off gave
    expect(job.items[0].walls).toEqual([{ lengthM: 5, end: 'internal' }, { lengthM: 3.1 }])
    // our own worked example split by hand: £579.24, £51.13, £582.13; fixing and delivery (£161.25) stay on the quote
    const estimates = await testDb()('job_items').where({ job_id: r.data.jobId }).orderBy('sort_order').pluck('estimate_minor')
    expect(estimates.map(Number)).toEqual([57924, 5113, 58213])
    // and the client's price of each, margin included (split by hand there too): £666.14, £58.80, £669.45
    const prices = await testDb()('job_items').where({ job_id: r.data.jobId }).orderBy('sort_order').pluck('price_minor')
    expect(prices.map(Number)).toEqual([66614, 5880, 66945])
    expect((await call(`/api/jobs/${r.data.jobId}/payments`, { cookie: lead })).data).toMatchObject({ depositMinor: 56875, paidMinor: 0, released: false })

    const linked = (await call(`/api/quotes/${id}`, { cookie: lead })).data
    expect(linked.jobId).toBe(r.data.jobId)
    // the client's people follow the job and see its deposit; another organisation does not
    expect((await call(`/api/client/jobs/${r.data.jobId}/deposit`, { cookie: ada })).data).toMatchObject({ depositMinor: 56875, outstandingMinor: 56875 })
    expect((await call(`/api/client/jobs/${r.data.jobId}`, { cookie: ravi })).status).toBe(404)
  })

  it('puts the job at a site of the client picked from their list, and refuses another client\'s site', async () => {
    const k = testDb()
    const [own] = await k('client_sites').insert({ workshop_id: (await k('client_orgs').where({ id: clientOrgId }).first('workshop_id')).workshop_id, client_org_id: clientOrgId, name: `Picked ${code()}`, address: '2 Example Row' }).returning('id')
    const otherOrg = Number((await k('users').whereRaw('lower(email) = lower(?)', [demo.client2.email]).first('client_org_id')).client_org_id)
    const [theirs] = await k('client_sites').insert({ workshop_id: (await k('client_orgs').where({ id: otherOrg }).first('workshop_id')).workshop_id, client_org_id: otherOrg, name: `Not ada's ${code()}`, address: '3 Example Row' }).returning('id')
    const id = await quote()
    const refused = await call(`/api/quotes/${id}/job`, { method: 'POST', cookie: lead, body: { jobCode: code(), siteId: Number(theirs.id) } })
    expect(refused.status).toBe(422)
    expect(JSON.stringify(refused.data)).toMatch(/Site is not one of this client's sites/)
    const neither = await call(`/api/quotes/${id}/job`, { method: 'POST', cookie: lead, body: { jobCode: code() } })
    expect(neither.status).toBe(422)
    expect(JSON.stringify(neither.data)).toMatch(/Pick one of the client's sites/)
    // nothing was made by the refusals
    expect((await call(`/api/quotes/${id}`, { cookie: lead })).data.jobId).toBeNull()
    const ok = await call(`/api/quotes/${id}/job`, { method: 'POST', cookie: lead, body: { jobCode: code(), siteId: Number(own.id) } })
    expect(ok.status).toBe(201)
    expect(ok.data.job.siteId).toBe(Number(own.id))
  })

  it('refuses a quote not accepted, a second job from the same quote, and a job code in use, in words', async () => {
    const sentOnly = await quote(false)
    const notYet = await call(`/api/quotes/${sentOnly}/job`, { method: 'POST', cookie: lead, body: { jobCode: code(), newSite: { name: `S ${code()}`, address: 'x' } } })
    expect(notYet.status).toBe(409)
    expect(notYet.data.message).toMatch(/has not been accepted/)

    const id = await quote()
    const jobCode = code()
    const body = (c: string) => ({ jobCode: c, newSite: { name: `Twice ${randomUUID().slice(0, 6)}`, address: '4 Example Row' } })
    // two clicks at once make one job
    const codes = [jobCode, code()]
    const both = await Promise.all(codes.map(c => call(`/api/quotes/${id}/job`, { method: 'POST', cookie: lead, body: body(c) })))
    expect(both.map(r => r.status).sort()).toEqual([201, 409])
    // the code the winning click made the job with
    const made = codes[both.findIndex(r => r.status === 201)]!
    const again = await call(`/api/quotes/${id}/job`, { method: 'POST', cookie: lead, body: body(code()) })
    expect(again.status).toBe(409)
    expect(again.data.message).toMatch(/has already been made into job/)
    expect(await testDb()('jobs').where({ notes: `From quote ${(await call(`/api/quotes/${id}`, { cookie: lead })).data.number}, revision 1` }).count('* as n').first()).toMatchObject({ n: '1' })

    const other = await quote()
    const taken = await call(`/api/quotes/${other}/job`, { method: 'POST', cookie: lead, body: body(made) })
    expect([taken.status, taken.data.message]).toEqual([409, 'A job with this code already exists'])
    expect((await call(`/api/quotes/${other}`, { cookie: lead })).data.jobId).toBeNull()
  })
})
