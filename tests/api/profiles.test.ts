// Profiles: named by the lead on a mould or an item; the planner casts an item that names only
// a profile on any ready mould of it.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { call, signIn } from '../setup/http'
import { DEMO_PASSWORD, closeTestDb, demo } from '../setup/fixtures'
import { boardFixture } from '../setup/board-fixtures'

// The week of Monday 6 September 2027, away from the demo's days and other files'.
const range = { from: '2027-09-06', to: '2027-09-10' }
let lead = ''
let caster = ''
let fx: Awaited<ReturnType<typeof boardFixture>>

beforeAll(async () => {
  lead = await signIn(demo.lead.email, DEMO_PASSWORD)
  caster = await signIn(demo.caster1.email, DEMO_PASSWORD)
  fx = await boardFixture('prof')
})
afterAll(closeTestDb)

const newMould = (code: string, profile: string | null) => call('/api/moulds', {
  method: 'POST', cookie: lead,
  body: { code, casts: 'Egg-and-dart cornice', material: 'silicone', benchId: fx.benchId, cavityLitres: 2, prepMinutes: 10, cleanMinutes: 10, maxDwellMinutes: 240, pulls: 0, profile },
})

describe('profiles', () => {
  it('creates a profile once whatever the case of its name, and lists its moulds', async () => {
    const a = await call('/api/profiles', { method: 'POST', cookie: lead, body: { name: `Egg-and-dart ${fx.tag}` } })
    expect(a.status).toBe(201)
    const b = await call('/api/profiles', { method: 'POST', cookie: lead, body: { name: `  EGG-AND-DART ${fx.tag.toUpperCase()} ` } })
    expect(b.data.id).toBe(a.data.id)
    const m = await newMould(`${fx.tag}-A`, `egg-and-dart ${fx.tag}`)
    expect(m.status).toBe(201)
    expect(m.data.profile).toBe(`Egg-and-dart ${fx.tag}`)
    const list = await call('/api/profiles', { cookie: caster })
    expect(list.status).toBe(200)
    expect(list.data.find((p: { id: number }) => p.id === a.data.id)).toMatchObject({ moulds: 1, readyMoulds: 1 })
    expect((await call('/api/profiles', { method: 'POST', cookie: caster, body: { name: 'x' } })).status).toBe(403)
    const empty = await call('/api/profiles', { method: 'POST', cookie: lead, body: { name: '  ' } })
    expect(empty.status).toBe(422)
    expect(empty.data.data.problems[0]).toMatchObject({ field: 'name', message: expect.stringMatching(/required/) })
  })

  it('plans an item that names only a profile on every ready mould of it, and accepts the plan', async () => {
    const name = `Ceiling rose ${fx.tag}`
    const m1 = (await newMould(`${fx.tag}-R1`, name)).data.id as number
    const m2 = (await newMould(`${fx.tag}-R2`, name)).data.id as number
    const m3 = (await newMould(`${fx.tag}-R3`, name)).data
    await call(`/api/moulds/${m3.id}/state`, { method: 'POST', cookie: lead, body: { state: 'repair', reason: 'Torn key', version: m3.version } })
    const job = await fx.job({ due_on: '2027-09-30' })
    const added = await call(`/api/jobs/${job}/items`, {
      method: 'POST', cookie: lead, body: { kind: 'pieces', profile: name.toLowerCase(), description: 'Roses for the hall', quantity: 4, gradeId: fx.gradeId },
    })
    expect(added.status).toBe(201)
    const r = await call('/api/planner/preview', { method: 'POST', cookie: lead, body: range })
    expect(r.status).toBe(200)
    const mine = r.data.pours.filter((p: { jobItemId: number }) => p.jobItemId === added.data.id)
    expect(mine).toHaveLength(4)
    expect(new Set(mine.map((p: { mouldId: number }) => p.mouldId))).toEqual(new Set([m1, m2]))
    const ok = await call('/api/planner/accept', {
      method: 'POST', cookie: lead,
      body: { ...range, pours: mine.map((p: { jobItemId: number; mouldId: number; slotStart: string; casterId: number | null }) => ({ jobItemId: p.jobItemId, mouldId: p.mouldId, slotStart: p.slotStart, casterId: p.casterId })) },
    })
    expect(ok.status).toBe(201)
    expect(ok.data).toEqual({ created: 4 })
  })
})
