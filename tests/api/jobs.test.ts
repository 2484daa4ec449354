// Job routes: jobs, items through the run calculator, client members, the sample round and
// the CSV of items. Role, tenancy, validation, conflicts and happy paths.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { call, signIn, tokenFrom, waitForMail } from '../setup/http'
import { DEMO_PASSWORD, closeTestDb, demo, demoWorkshopId, makeOtherWorkshop, makeUser, testDb } from '../setup/fixtures'
import { GRADE_PRESETS, batchForCavity, runCutList } from '#shared/utils/plaster'

let lead = ''
let caster = ''
let client = ''
const uid = () => Math.random().toString(36).slice(2, 8).toUpperCase()
const walls = [{ lengthM: 5.2 }, { lengthM: 4.1 }, { lengthM: 3.05 }]

beforeAll(async () => {
  lead = await signIn(demo.lead.email, DEMO_PASSWORD)
  caster = await signIn(demo.caster1.email, DEMO_PASSWORD)
  client = await signIn(demo.client1.email, DEMO_PASSWORD)
})
afterAll(closeTestDb)

async function newJob(extra: Record<string, unknown> = {}) {
  const r = await call('/api/jobs', { method: 'POST', cookie: lead, body: { code: `J-${uid()}`, title: 'Test job', site: 'Test site', dueOn: '2027-01-15', notes: 'Internal: price agreed', ...extra } })
  expect(r.status).toBe(201)
  return r.data
}
async function catalogue() {
  const moulds = (await call('/api/moulds', { cookie: lead })).data
  const grades = (await call('/api/grades', { cookie: lead })).data
  return { cr101: moulds.find((m: { code: string }) => m.code === 'CR-101'), cb12: moulds.find((m: { code: string }) => m.code === 'CB-12'), beta: grades.find((g: { presetKey: string }) => g.presetKey === 'beta-casting') }
}

describe('jobs', () => {
  it('a lead creates and edits a job; codes are unique; fields are validated; versions are checked', async () => {
    const job = await newJob()
    expect(job).toMatchObject({ state: 'open', sampleState: 'not_required', dueOn: '2027-01-15', version: 1 })
    expect((await call('/api/jobs', { method: 'POST', cookie: lead, body: { code: job.code, title: 'Again' } })).status).toBe(409)
    for (const [field, value] of [['code', ''], ['title', ''], ['dueOn', '15/01/2027'], ['state', 'lost'], ['sampleRequired', 'yes']] as const) {
      const bad = await call('/api/jobs', { method: 'POST', cookie: lead, body: { code: `J-${uid()}`, title: 'T', [field]: value } })
      expect(bad.status, field).toBe(422)
      expect(bad.data.data.problems[0].field).toBe(field)
    }
    const edited = await call(`/api/jobs/${job.id}`, { method: 'PATCH', cookie: lead, body: { sampleRequired: true, state: 'on_hold', version: 1 } })
    expect(edited.data).toMatchObject({ sampleState: 'awaiting_cast', state: 'on_hold', version: 2 })
    expect((await call(`/api/jobs/${job.id}`, { method: 'PATCH', cookie: lead, body: { title: 'x', version: 1 } })).status).toBe(409)
    const list = await call('/api/jobs', { cookie: caster })
    expect(list.data.some((j: { id: number }) => j.id === job.id)).toBe(true)
  })

  it('adds a run item from walls: pieces from the cut list with spares, plaster in kg and bags', async () => {
    const job = await newJob()
    const { cr101, beta } = await catalogue()
    const r = await call(`/api/jobs/${job.id}/items`, { method: 'POST', cookie: lead, body: { kind: 'run', mouldId: cr101.id, description: 'Hall cornice', walls, sparesPct: 10, minPieceM: 0.3, gradeId: beta.id } })
    expect(r.status).toBe(201)
    const cut = runCutList({ walls, castLengthM: 1.2, minPieceM: 0.3, sparesPct: 10 })
    expect(r.data).toMatchObject({ piecesNeeded: cut.lengths, runM: 12.35, consistency: 70, quantity: null })
    const detail = await call(`/api/jobs/${job.id}`, { cookie: lead })
    const item = detail.data.items[0]
    expect(item.plan.cutList.lengths).toBe(cut.lengths)
    const perCast = batchForCavity({ cavityLitres: 6.5, consistency: 70, grade: GRADE_PRESETS['beta-casting'], wastePct: 5 }).plasterKg
    expect(item.plan.plaster.plasterKg).toBeCloseTo(perCast * cut.lengths, 6)
    expect(item.plan.plaster.bags).toBe(Math.ceil(perCast * cut.lengths / 25))
    expect(detail.data.notes).toBe('Internal: price agreed')
  })

  it('passes a run\'s corners, returns, saw cut and corner blocks to the run calculator and keeps them', async () => {
    const job = await newJob()
    const { cr101 } = await catalogue()
    const cornered = [{ lengthM: 4, start: 'external', end: 'internal' }, { lengthM: 3, start: 'internal', end: 'return' }] as const
    const body = { kind: 'run', mouldId: cr101.id, description: 'Bay cornice', walls: cornered, sparesPct: 0, minPieceM: 0.3, projectionM: 0.12, sawCutM: 0.003, cornerBlockLegM: 0.15 }
    const r = await call(`/api/jobs/${job.id}/items`, { method: 'POST', cookie: lead, body })
    expect(r.status, JSON.stringify(r.data)).toBe(201)
    const cut = runCutList({ walls: [...cornered], castLengthM: 1.2, minPieceM: 0.3, sparesPct: 0, projectionM: 0.12, sawCutM: 0.003, cornerBlockLegM: 0.15 })
    expect(r.data).toMatchObject({ piecesNeeded: cut.lengths, projectionM: 0.12, sawCutM: 0.003, cornerBlockLegM: 0.15, walls: cornered })
    const item = (await call(`/api/jobs/${job.id}`, { cookie: lead })).data.items[0]
    // by hand (plaster-cutlist.ts header): 4 + 0.12 (external mitre) − 0.15 (block leg) = 3.97 m;
    // 3 − 0.15 + 0.12 (return mitre) = 2.97 m, a 0.12 m return piece; one block for the one internal corner
    expect(item.plan.cutList.runM.map((m: number) => Number(m.toFixed(3)))).toEqual([3.97, 2.97])
    expect(item.plan.cutList.cornerBlocks).toBe(1)
    expect(item.plan.cutList.cuts.filter((c: { kind: string }) => c.kind === 'return').map((c: { lengthM: number }) => c.lengthM)).toEqual([0.12])
    // an external corner without the projection is refused naming it
    const bad = await call(`/api/jobs/${job.id}/items`, { method: 'POST', cookie: lead, body: { ...body, projectionM: null } })
    expect(bad.status).toBe(422)
    expect(bad.data.data.problems[0].field).toBe('projectionM')
  })

  it('validates items: each bad field is a 422 naming it; a run needs a mould with a cast length', async () => {
    const job = await newJob()
    const { cr101, cb12 } = await catalogue()
    const base = { kind: 'pieces', mouldId: cr101.id, description: 'Lengths', quantity: 4 }
    const cases: [Record<string, unknown>, string][] = [
      [{ kind: 'cast' }, 'kind'], [{ description: '' }, 'description'], [{ quantity: 0 }, 'quantity'], [{ quantity: null }, 'quantity'],
      [{ consistency: 10 }, 'consistency'], [{ kind: 'run', quantity: null }, 'walls'], [{ kind: 'run', walls: [{ lengthM: 0 }] }, 'walls.0.lengthM'],
      [{ kind: 'run', walls, mouldId: cb12.id }, 'mouldId'], [{ mouldId: 999999 }, 'mouldId'], [{ gradeId: 999999 }, 'gradeId'],
      [{ kind: 'run', walls: [{ lengthM: 0.1 }], minPieceM: 0.5 }, 'walls.0.lengthM'], [{ sparesPct: 120 }, 'sparesPct'],
    ]
    for (const [patch, field] of cases) {
      const bad = await call(`/api/jobs/${job.id}/items`, { method: 'POST', cookie: lead, body: { ...base, ...patch } })
      expect(bad.status, JSON.stringify(patch)).toBe(422)
      expect(bad.data.data.problems[0].field).toBe(field)
    }
  })

  it('edits and removes an item with its version; exports items as CSV', async () => {
    const job = await newJob()
    const { cb12 } = await catalogue()
    const item = (await call(`/api/jobs/${job.id}/items`, { method: 'POST', cookie: lead, body: { kind: 'pieces', mouldId: cb12.id, description: 'Corbels', quantity: 4 } })).data
    const edited = await call(`/api/jobs/${job.id}/items/${item.id}`, { method: 'PATCH', cookie: lead, body: { kind: 'pieces', mouldId: cb12.id, description: 'Corbels', quantity: 6, version: 1 } })
    expect(edited.data).toMatchObject({ piecesNeeded: 6, version: 2 })
    const stale = await call(`/api/jobs/${job.id}/items/${item.id}`, { method: 'PATCH', cookie: lead, body: { kind: 'pieces', mouldId: cb12.id, description: 'Corbels', quantity: 7, version: 1 } })
    expect(stale.status).toBe(409)
    const csv = await call(`/api/jobs/${job.id}/export`, { cookie: lead })
    expect(csv.headers.get('content-type')).toMatch(/text\/csv/)
    expect(String(csv.data)).toContain(`${job.code},Corbels,CB-12,,6,,0,6`)
    expect((await call(`/api/jobs/${job.id}/items/${item.id}`, { method: 'DELETE', cookie: lead })).status).toBe(204)
    expect((await call(`/api/jobs/${job.id}/items/${item.id}`, { method: 'DELETE', cookie: lead })).status).toBe(404)
  })

  it('refuses to delete an item that already has pours', async () => {
    const fernhill = (await call('/api/jobs', { cookie: lead })).data.find((j: { code: string }) => j.code === 'J-2601')
    const detail = await call(`/api/jobs/${fernhill.id}`, { cookie: lead })
    const cornice = detail.data.items.find((i: { description: string }) => i.description.startsWith('Cornice run'))
    expect((await call(`/api/jobs/${fernhill.id}/items/${cornice.id}`, { method: 'DELETE', cookie: lead })).status).toBe(409)
  })
})

describe('clients on a job', () => {
  it('a client sees only their jobs, without internal notes, and cannot change them', async () => {
    const jobs = (await call('/api/jobs', { cookie: lead })).data
    const mill = jobs.find((j: { code: string }) => j.code === 'J-2603')
    const alder = jobs.find((j: { code: string }) => j.code === 'J-2602')
    const mine = await call(`/api/client/jobs/${mill.id}`, { cookie: client })
    expect(mine.status).toBe(200)
    expect(mine.data).toMatchObject({ code: 'J-2603', sampleRequired: expect.any(Boolean), released: expect.any(Boolean) })
    expect(mine.data).not.toHaveProperty('notes')
    expect(mine.data).not.toHaveProperty('members')
    expect(mine.data.items[0]).not.toHaveProperty('plan')
    expect((await call(`/api/client/jobs/${alder.id}`, { cookie: client })).status).toBe(404)
    // the staff view of a job is no route for a client at all
    expect((await call(`/api/jobs/${mill.id}`, { cookie: client })).status).toBe(403)
    const list = (await call('/api/client/jobs', { cookie: client })).data
    expect(list.find((j: { code: string }) => j.code === 'J-2603')).toMatchObject({ itemCount: mine.data.items.length })
    expect(list.some((j: { code: string }) => j.code === 'J-2602')).toBe(false)
    expect((await call(`/api/jobs/${mill.id}`, { method: 'PATCH', cookie: client, body: { title: 'x', version: 1 } })).status).toBe(403)
    expect((await call('/api/jobs', { cookie: client })).status).toBe(403)
  })

  it('a lead invites a new client by e-mail into a job; accepting makes them a member', async () => {
    const job = await newJob()
    const email = `newclient-${uid().toLowerCase()}@fixture.example.test`
    const r = await call(`/api/jobs/${job.id}/members`, { method: 'POST', cookie: lead, body: { email, name: 'New Client' } })
    expect(r.status).toBe(201)
    expect(r.data.status).toBe('invited')
    const mail = await waitForMail(lead, email, 'invited you')
    const accepted = await call('/api/auth/invitation', { method: 'POST', body: { token: tokenFrom(mail.text), name: 'New Client', password: 'a-long-password-1' } })
    expect(accepted.status).toBeLessThan(300)
    const detail = await call(`/api/jobs/${job.id}`, { cookie: lead })
    expect(detail.data.members.map((m: { email: string }) => m.email)).toContain(email)
    const bad = await call(`/api/jobs/${job.id}/members`, { method: 'POST', cookie: lead, body: { email: 'not-an-email' } })
    expect(bad.data.data.problems[0].field).toBe('email')
  })

  it('an existing client is added at once; a staff e-mail is refused', async () => {
    const job = await newJob()
    const existing = await makeUser(await demoWorkshopId(), 'client', 'existing-client')
    const r = await call(`/api/jobs/${job.id}/members`, { method: 'POST', cookie: lead, body: { email: existing.email } })
    expect(r.status).toBe(200)
    expect(r.data.status).toBe('added')
    expect((await call(`/api/jobs/${job.id}/members`, { method: 'POST', cookie: lead, body: { email: demo.caster1.email } })).status).toBe(409)
  })

  it('a lead takes a client off a job; the client then gets 404 for it', async () => {
    const job = await newJob()
    const member = await makeUser(await demoWorkshopId(), 'client', 'removed-client')
    await call(`/api/jobs/${job.id}/members`, { method: 'POST', cookie: lead, body: { email: member.email } })
    const memberCookie = await signIn(member.email, DEMO_PASSWORD)
    expect((await call(`/api/client/jobs/${job.id}`, { cookie: memberCookie })).status).toBe(200)
    expect((await call(`/api/jobs/${job.id}/members/${member.id}`, { method: 'DELETE', cookie: lead })).status).toBe(204)
    expect((await call(`/api/client/jobs/${job.id}`, { cookie: memberCookie })).status).toBe(404)
    expect((await call(`/api/jobs/${job.id}/members/${member.id}`, { method: 'DELETE', cookie: lead })).status).toBe(404)
    expect((await call(`/api/jobs/${job.id}/members/abc`, { method: 'DELETE', cookie: lead })).data.data.problems[0].field).toBe('params.userId')
  })
})

describe('sample approval', () => {
  it('lead marks the sample ready (client mailed); the client approves; recorded, mailed and released', async () => {
    const ws = await demoWorkshopId()
    const member = await makeUser(ws, 'client', 'sample-client')
    const job = await newJob({ sampleRequired: true })
    await testDb()('job_members').insert({ workshop_id: ws, job_id: job.id, user_id: member.id })
    const memberCookie = await signIn(member.email, DEMO_PASSWORD)
    expect((await call(`/api/jobs/${job.id}/sample-decision`, { method: 'POST', cookie: memberCookie, body: { decision: 'approved' } })).status).toBe(409)
    const ready = await call(`/api/jobs/${job.id}/sample`, { method: 'POST', cookie: lead, body: { state: 'awaiting_approval', version: 1 } })
    expect(ready.data.sampleState).toBe('awaiting_approval')
    await waitForMail(lead, member.email, 'Sample ready for your approval')
    expect((await call(`/api/jobs/${job.id}/sample-decision`, { method: 'POST', cookie: lead, body: { decision: 'approved' } })).status).toBe(403)
    const before = await call(`/api/client/jobs/${job.id}`, { cookie: memberCookie })
    expect(before.data.released).toBe(false)
    const ok = await call(`/api/jobs/${job.id}/sample-decision`, { method: 'POST', cookie: memberCookie, body: { decision: 'approved', comment: 'Crisp, go ahead' } })
    expect(ok.status).toBe(200)
    expect(ok.data).toMatchObject({ sampleState: 'approved', released: true, sampleDecidedAt: expect.any(String) })
    const row = await testDb()('jobs').where({ id: job.id }).first()
    expect(Number(row.sample_decided_by)).toBe(member.id)
    const events = await testDb()('events').where({ entity: 'job', entity_id: String(job.id) }).orderBy('id')
    expect(events.map(e => e.type)).toEqual(['sample.awaiting_approval', 'sample.approved'])
    await waitForMail(lead, demo.lead.email, `${job.code}: Fixture sample-client approved the sample`)
    expect((await call(`/api/jobs/${job.id}/sample-decision`, { method: 'POST', cookie: memberCookie, body: { decision: 'changes_requested', comment: 'late' } })).status).toBe(409)
  })

  it('asking for changes needs a comment; a client who is not a member gets 404', async () => {
    const ws = await demoWorkshopId()
    // a fixture client, so the demo clients' job lists stay as the other files expect
    const other = await makeUser(ws, 'client', 'changes-client')
    const otherCookie = await signIn(other.email, DEMO_PASSWORD)
    const job = await newJob({ sampleRequired: true })
    await call(`/api/jobs/${job.id}/sample`, { method: 'POST', cookie: lead, body: { state: 'awaiting_approval', version: 1 } })
    expect((await call(`/api/jobs/${job.id}/sample-decision`, { method: 'POST', cookie: otherCookie, body: { decision: 'approved' } })).status).toBe(404)
    await testDb()('job_members').insert({ workshop_id: ws, job_id: job.id, user_id: other.id })
    const noComment = await call(`/api/jobs/${job.id}/sample-decision`, { method: 'POST', cookie: otherCookie, body: { decision: 'changes_requested' } })
    expect(noComment.data.data.problems[0].field).toBe('comment')
    const bad = await call(`/api/jobs/${job.id}/sample-decision`, { method: 'POST', cookie: otherCookie, body: { decision: 'maybe' } })
    expect(bad.data.data.problems[0].field).toBe('decision')
    const changes = await call(`/api/jobs/${job.id}/sample-decision`, { method: 'POST', cookie: otherCookie, body: { decision: 'changes_requested', comment: 'Deeper egg, please' } })
    expect(changes.data).toMatchObject({ sampleState: 'changes_requested', sampleComment: 'Deeper egg, please', released: false })
  })

  it('keeps workshops apart', async () => {
    const other = await makeOtherWorkshop()
    const otherLead = await signIn(other.lead.email, DEMO_PASSWORD)
    const demoJob = (await call('/api/jobs', { cookie: lead })).data[0]
    expect((await call(`/api/jobs/${demoJob.id}`, { cookie: otherLead })).status).toBe(404)
    expect((await call(`/api/jobs/${demoJob.id}/items`, { method: 'POST', cookie: otherLead, body: { kind: 'pieces', profile: 'x', description: 'x', quantity: 1 } })).status).toBe(404)
    expect((await call(`/api/jobs/${demoJob.id}/export`, { cookie: otherLead })).status).toBe(404)
    expect((await call('/api/jobs', { cookie: otherLead })).data.map((j: { code: string }) => j.code)).toEqual(['X-1'])
  })
})
