// Clients and sites (server/services/clients.ts): organisations with contacts and sites, each
// scoped to its workshop; jobs name a client and one of its sites; a job's client mail goes to
// the contacts who have that mail on (server/services/notify.ts), and only the lead manages them.
import { randomUUID } from 'node:crypto'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { call, signIn } from '../setup/http'
import { DEMO_PASSWORD, closeTestDb, demo, demoWorkshopId, makeOtherWorkshop, makeUser, testDb } from '../setup/fixtures'

let lead = ''
let ws = 0
afterAll(closeTestDb)
beforeAll(async () => {
  lead = await signIn(demo.lead.email, DEMO_PASSWORD)
  ws = await demoWorkshopId()
})
const uid = () => randomUUID().slice(0, 6)

async function newClient(name = `Client ${uid()}`) {
  const r = await call('/api/clients', { method: 'POST', cookie: lead, body: { name, notes: 'Pays on 30 days' } })
  expect(r.status).toBe(201)
  return r.data as { id: number; name: string; version: number }
}

describe('client organisations, contacts and sites', () => {
  it('a lead creates a client with contacts and sites, and reads them back on its page', async () => {
    const org = await newClient()
    const c = await call(`/api/clients/${org.id}/contacts`, { method: 'POST', cookie: lead, body: { name: 'Iris Vane', email: 'Iris@vane.example.test', phone: '+44 1632 960000', role: 'Site manager', mailSamples: false } })
    expect(c.status).toBe(201)
    expect(c.data).toMatchObject({ clientOrgId: org.id, email: 'iris@vane.example.test', mailProgress: true, mailSamples: false, mailDispatch: true })
    const s = await call(`/api/clients/${org.id}/sites`, { method: 'POST', cookie: lead, body: { name: 'Orchard Court', address: '5 Orchard Court, Example Town', postcode: 'EX5 5AA', openingHours: '08:00–15:00', parking: 'Yard at the back', lifting: 'Scaffold hoist' } })
    expect(s.status).toBe(201)
    const detail = await call(`/api/clients/${org.id}`, { cookie: lead })
    expect(detail.status).toBe(200)
    expect(detail.data.contacts.map((x: { name: string }) => x.name)).toEqual(['Iris Vane'])
    expect(detail.data.sites[0]).toMatchObject({ name: 'Orchard Court', postcode: 'EX5 5AA', lifting: 'Scaffold hoist' })
    const list = await call('/api/clients', { cookie: lead })
    expect(list.data.find((o: { id: number }) => o.id === org.id)).toMatchObject({ contactCount: 1, siteCount: 1, jobCount: 0 })
    // a second contact with the same e-mail at this client is refused; the name is unique too
    expect((await call(`/api/clients/${org.id}/contacts`, { method: 'POST', cookie: lead, body: { name: 'Again', email: 'iris@vane.example.test' } })).status).toBe(409)
    expect((await call('/api/clients', { method: 'POST', cookie: lead, body: { name: org.name } })).status).toBe(409)
  })

  it('edits are versioned, and bad input names the field in the form\'s words', async () => {
    const org = await newClient()
    const ok = await call(`/api/clients/${org.id}`, { method: 'PATCH', cookie: lead, body: { name: `${org.name} Ltd`, version: org.version } })
    expect(ok.status).toBe(200)
    expect((await call(`/api/clients/${org.id}`, { method: 'PATCH', cookie: lead, body: { name: 'Stale', version: org.version } })).status).toBe(409)
    const bad = await call(`/api/clients/${org.id}/contacts`, { method: 'POST', cookie: lead, body: { name: '', email: 'x@y.example.test' } })
    expect(bad.status).toBe(422)
    expect(bad.data.data.problems[0]).toMatchObject({ field: 'name' })
    expect(bad.data.message).toMatch(/Name is required/)
    const site = await call(`/api/clients/${org.id}/sites`, { method: 'POST', cookie: lead, body: { name: 'No address' } })
    expect(site.status).toBe(422)
    expect(site.data.message).toMatch(/Address/)
  })

  it('another workshop\'s client, contact and site are a 404, and never listed', async () => {
    const other = await makeOtherWorkshop()
    const k = testDb()
    const [org] = await k('client_orgs').insert({ workshop_id: other.workshopId, name: `Hidden ${uid()}` }).returning('id')
    const [contact] = await k('client_contacts').insert({ workshop_id: other.workshopId, client_org_id: org.id, name: 'Hidden', email: 'hidden@other.example.test' }).returning('id')
    const [site] = await k('client_sites').insert({ workshop_id: other.workshopId, client_org_id: org.id, name: 'Hidden site', address: 'x' }).returning('id')
    expect((await call(`/api/clients/${org.id}`, { cookie: lead })).status).toBe(404)
    expect((await call(`/api/clients/${org.id}/contacts`, { method: 'POST', cookie: lead, body: { name: 'X', email: 'x@x.example.test' } })).status).toBe(404)
    expect((await call(`/api/contacts/${contact.id}`, { method: 'PATCH', cookie: lead, body: { mailProgress: false, version: 1 } })).status).toBe(404)
    expect((await call(`/api/contacts/${contact.id}`, { method: 'DELETE', cookie: lead })).status).toBe(404)
    expect((await call(`/api/sites/${site.id}`, { method: 'PATCH', cookie: lead, body: { parking: 'x', version: 1 } })).status).toBe(404)
    expect(JSON.stringify((await call('/api/clients', { cookie: lead })).data)).not.toContain('Hidden')
    expect(JSON.stringify((await call('/api/sites', { cookie: lead })).data)).not.toContain('Hidden site')
    // nor can a job name them
    const job = await call('/api/jobs', { method: 'POST', cookie: lead, body: { code: `CL-${uid()}`, title: 'Leaky', clientOrgId: Number(org.id) } })
    expect(job.status).toBe(422)
    expect(job.data.data.problems[0].field).toBe('clientOrgId')
    const job2 = await call('/api/jobs', { method: 'POST', cookie: lead, body: { code: `CL-${uid()}`, title: 'Leaky', siteId: Number(site.id) } })
    expect(job2.status).toBe(422)
    expect(job2.data.data.problems[0].field).toBe('siteId')
  })

  it('only a lead reads or manages clients', async () => {
    const org = await newClient()
    for (const who of [demo.caster1, demo.finisher, demo.client1]) {
      const c = await signIn(who.email, DEMO_PASSWORD)
      expect((await call('/api/clients', { cookie: c })).status).toBe(403)
      expect((await call(`/api/clients/${org.id}`, { cookie: c })).status).toBe(403)
      expect((await call(`/api/clients/${org.id}/sites`, { method: 'POST', cookie: c, body: { name: 'S', address: 'A' } })).status).toBe(403)
    }
    expect((await call('/api/clients')).status).toBe(401)
  })

  it('a job names a client and one of its sites; a site of another client is refused', async () => {
    const [a, b] = [await newClient(), await newClient()]
    const siteA = (await call(`/api/clients/${a.id}/sites`, { method: 'POST', cookie: lead, body: { name: 'Quarry House', address: '9 Quarry Road' } })).data
    const siteB = (await call(`/api/clients/${b.id}/sites`, { method: 'POST', cookie: lead, body: { name: 'Bell Yard', address: '2 Bell Yard' } })).data
    const job = await call('/api/jobs', { method: 'POST', cookie: lead, body: { code: `CL-${uid()}`, title: 'Hall cornice', clientOrgId: a.id, siteId: siteA.id } })
    expect(job.status).toBe(201)
    expect(job.data).toMatchObject({ clientOrgId: a.id, siteId: siteA.id, site: 'Quarry House' })
    const wrong = await call(`/api/jobs/${job.data.id}`, { method: 'PATCH', cookie: lead, body: { siteId: siteB.id, version: job.data.version } })
    expect(wrong.status).toBe(422)
    expect(wrong.data.data.problems[0]).toMatchObject({ field: 'siteId' })
    expect(wrong.data.message).toMatch(/Site is not a site of this client/)
    // moving the job to the other client with its site works, and the client's page lists it
    const moved = await call(`/api/jobs/${job.data.id}`, { method: 'PATCH', cookie: lead, body: { clientOrgId: b.id, siteId: siteB.id, version: job.data.version } })
    expect(moved.status).toBe(200)
    expect(moved.data).toMatchObject({ clientOrgId: b.id, siteId: siteB.id })
    expect((await call(`/api/clients/${b.id}`, { cookie: lead })).data.jobs).toEqual([expect.objectContaining({ id: job.data.id, siteName: 'Bell Yard' })])
    // a site alone brings its client
    const bySite = await call('/api/jobs', { method: 'POST', cookie: lead, body: { code: `CL-${uid()}`, title: 'Niche', siteId: siteA.id } })
    expect(bySite.data).toMatchObject({ clientOrgId: a.id, siteId: siteA.id })
  })

  it('the client\'s portal members are its client users; a member invited to its job joins the client and its contacts', async () => {
    const org = await newClient()
    const job = (await call('/api/jobs', { method: 'POST', cookie: lead, body: { code: `CL-${uid()}`, title: 'Portal', clientOrgId: org.id } })).data
    const email = `portal-${uid()}@client.example.test`
    const r = await call(`/api/jobs/${job.id}/members`, { method: 'POST', cookie: lead, body: { email, name: 'Pia Portal' } })
    expect(r.data.status).toBe('invited')
    const inv = await testDb()('invitations').where({ email }).first('client_org_id')
    expect(Number(inv.client_org_id)).toBe(org.id)
    const member = await makeUser(ws, 'client', 'portal')
    await testDb()('users').where({ id: member.id }).update({ client_org_id: org.id })
    const detail = (await call(`/api/clients/${org.id}`, { cookie: lead })).data
    expect(detail.members.map((m: { email: string }) => m.email)).toContain(member.email)
    expect(detail.contacts.map((c: { email: string }) => c.email)).toContain(email)
  })
})

describe('a job\'s client mail follows the contacts\' settings', () => {
  const outbox = (jobCode: string, kind: string) => testDb()('mail_outbox').where({ kind }).whereLike('subject', `%${jobCode}%`).pluck('to_email')

  it('sample mail goes to the contacts with sample mail on, not the others, and not to a disabled user', async () => {
    const org = await newClient()
    const add = (name: string, email: string, flags: Record<string, boolean>) => call(`/api/clients/${org.id}/contacts`, { method: 'POST', cookie: lead, body: { name, email, ...flags } })
    const t = uid()
    await add('Sam Samples', `sam-${t}@mail.example.test`, {})
    await add('Pat Progress', `pat-${t}@mail.example.test`, { mailSamples: false })
    const off = await makeUser(ws, 'client', `off-${t}`)
    await add('Off User', off.email, {})
    await testDb()('users').where({ id: off.id }).update({ disabled_at: new Date() })
    const job = (await call('/api/jobs', { method: 'POST', cookie: lead, body: { code: `ML-${t}`, title: 'Mail job', clientOrgId: org.id, sampleRequired: true } })).data
    const r = await call(`/api/jobs/${job.id}/sample`, { method: 'POST', cookie: lead, body: { state: 'awaiting_approval', version: job.version } })
    expect(r.status).toBe(200)
    expect(await outbox(job.code, 'sample_ready')).toEqual([`sam-${t}@mail.example.test`])
  })

  it('turning a contact\'s mail off takes them off the next mail; a contact who is a user keeps their own settings too', async () => {
    const org = await newClient()
    const t = uid()
    const user = await makeUser(ws, 'client', `pref-${t}`)
    await call('/api/me/notifications', { method: 'PATCH', cookie: await signIn(user.email, DEMO_PASSWORD), body: { job_ready: false } })
    const a = (await call(`/api/clients/${org.id}/contacts`, { method: 'POST', cookie: lead, body: { name: 'Ann', email: `ann-${t}@mail.example.test` } })).data
    await call(`/api/clients/${org.id}/contacts`, { method: 'POST', cookie: lead, body: { name: 'User contact', email: user.email } })
    const off = await call(`/api/contacts/${a.id}`, { method: 'PATCH', cookie: lead, body: { mailSamples: false, version: a.version } })
    expect(off.status).toBe(200)
    expect(off.data).toMatchObject({ mailSamples: false, mailDispatch: true })
    const job = (await call('/api/jobs', { method: 'POST', cookie: lead, body: { code: `MP-${t}`, title: 'Prefs job', clientOrgId: org.id, sampleRequired: true } })).data
    await call(`/api/jobs/${job.id}/sample`, { method: 'POST', cookie: lead, body: { state: 'awaiting_approval', version: job.version } })
    expect(await outbox(job.code, 'sample_ready')).toEqual([user.email])
    // a removed contact gets nothing
    const uc = (await call(`/api/clients/${org.id}`, { cookie: lead })).data.contacts.find((c: { email: string }) => c.email === user.email)
    expect((await call(`/api/contacts/${uc.id}`, { method: 'DELETE', cookie: lead })).status).toBe(204)
    const job2 = (await call('/api/jobs', { method: 'POST', cookie: lead, body: { code: `MQ-${t}`, title: 'Prefs job 2', clientOrgId: org.id, sampleRequired: true } })).data
    await call(`/api/jobs/${job2.id}/sample`, { method: 'POST', cookie: lead, body: { state: 'awaiting_approval', version: job2.version } })
    expect(await outbox(job2.code, 'sample_ready')).toEqual([])
  })
})
