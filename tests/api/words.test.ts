// Messages a person reads: every 422 names the field by the label they see (Water
// temperature, Consistency, Wall 5, Shortest piece), an empty required number says it is
// required, a clash names the other pour by its job and mould codes and time, and refusals
// carry their own status message (RFC 9110 §15 reason phrases), never "Server Error".
import { randomUUID } from 'node:crypto'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { call, signIn } from '../setup/http'
import { DEMO_PASSWORD, closeTestDb, demo, makeOtherWorkshop } from '../setup/fixtures'
import { boardFixture } from '../setup/board-fixtures'

let lead = ''
let caster = ''
let fx: Awaited<ReturnType<typeof boardFixture>>
let jobId = 0
let itemId = 0
let jobCode = ''

beforeAll(async () => {
  lead = await signIn(demo.lead.email, DEMO_PASSWORD)
  caster = await signIn(demo.caster1.email, DEMO_PASSWORD)
  fx = await boardFixture('words')
  jobId = await fx.job()
  itemId = await fx.item(jobId, null)
  jobCode = (await fx.k('jobs').where({ id: jobId }).first('code')).code
})
afterAll(closeTestDb)

async function plannedPour(slotStart = '2028-05-03T09:00:00Z') {
  const mouldId = await fx.mould()
  const r = await call('/api/pours', { method: 'POST', cookie: lead, body: { mouldId, slotStart, jobItemId: itemId, casterId: fx.casterId } })
  expect(r.status, JSON.stringify(r.data)).toBe(201)
  return r.data as { id: number; mouldId: number; mouldCode: string }
}
const startMixing = (pourId: number, extra: Record<string, unknown>) =>
  call(`/api/pours/${pourId}/actions`, { method: 'POST', cookie: caster, body: { actionId: randomUUID(), kind: 'start_mixing', version: 1, ...extra } })

describe('422s in the user\'s words', () => {
  it('an empty water temperature is required; one out of range names its label', async () => {
    const p = await plannedPour()
    const empty = await startMixing(p.id, {})
    expect(empty.status).toBe(422)
    expect(empty.data.data.problems[0]).toEqual({ field: 'waterTempC', message: 'Water temperature is required' })
    expect(empty.data.message).toBe('Water temperature is required')
    const hot = await startMixing(p.id, { waterTempC: 150 })
    expect(hot.data.data.problems[0].field).toBe('waterTempC')
    expect(hot.data.data.problems[0].message).toMatch(/^Water temperature must be between 0 and 99/)
    expect(hot.data.message).not.toMatch(/waterTempC/)
  })

  it('the mix calculator says Consistency, and that an empty one is required', async () => {
    const grade = await fx.k('plaster_grades').where({ id: fx.gradeId }).first('id')
    const body = { consistency: 70, wastePct: 0, waterTempC: 20, powderTempC: 20, shopTempC: 20, setFactor: 1, gradeId: grade.id, mouldId: await fx.mould() }
    const low = await call('/api/calc/mix', { method: 'POST', cookie: lead, body: { ...body, consistency: 5 } })
    expect(low.status).toBe(422)
    expect(low.data.data.problems[0].message).toMatch(/^Consistency must be/)
    const { consistency: _, ...none } = body
    const empty = await call('/api/calc/mix', { method: 'POST', cookie: lead, body: none })
    expect(empty.status).toBe(422)
    expect(empty.data.data.problems.find((q: { field: string }) => q.field === 'consistency')?.message).toBe('Consistency is required')
  })

  it('a wall the cut list cannot split names Wall 5 and the shortest piece, not walls[4] or minPieceM', async () => {
    const cr101 = await fx.k('moulds').where({ workshop_id: fx.workshopId, code: 'CR-101' }).first('id')
    const walls = [{ lengthM: 3 }, { lengthM: 3 }, { lengthM: 3 }, { lengthM: 3 }, { lengthM: 0.1 }]
    const r = await call(`/api/jobs/${jobId}/items`, { method: 'POST', cookie: lead, body: { kind: 'run', mouldId: Number(cr101.id), description: 'Hall cornice', walls, minPieceM: 0.5 } })
    expect(r.status).toBe(422)
    expect(r.data.data.problems[0].field).toBe('walls.4.lengthM')
    expect(r.data.message).toMatch(/^Wall 5 \(0\.1 m\) cannot be cut into pieces of 0\.5–[\d.]+ m: make the shortest piece shorter/)
    expect(r.data.message).not.toMatch(/walls|minPieceM/)
  })
})

describe('a clash names the other pour as the board shows it', () => {
  it('by its job and mould codes and its mix time, not its id', async () => {
    const p = await plannedPour('2028-05-04T09:00:00Z')
    const r = await call('/api/pours', { method: 'POST', cookie: lead, body: { mouldId: p.mouldId, slotStart: '2028-05-04T09:10:00Z' } })
    expect(r.status).toBe(409)
    expect(r.data.statusMessage).toBe('Conflict')
    expect(r.data.message).toMatch(new RegExp(`by the ${jobCode} pour on ${p.mouldCode} mixing at Thu 4 May 2028 \\d\\d:\\d\\d$`))
    expect(r.data.message).not.toContain(`pour ${p.id}`)
  })
})

describe('status messages', () => {
  it('401, 404 and 409 carry their reason phrase, never "Server Error"', async () => {
    const signedOut = await call('/api/board?from=2028-05-01&to=2028-05-02')
    expect(signedOut.status).toBe(401)
    expect(signedOut.data.statusMessage).toBe('Unauthorized')
    const other = await makeOtherWorkshop()
    const elsewhere = await call(`/api/jobs/${jobId}`, { cookie: await signIn(other.lead.email, DEMO_PASSWORD) })
    expect(elsewhere.status).toBe(404)
    expect(elsewhere.data.statusMessage).toBe('Not Found')
  })
})

describe('lots offered to a caster', () => {
  it('in-date lots first, oldest received first; an expired lot last and marked', async () => {
    const expired = await fx.lot({ lot_code: `${fx.tag}-OLD`, received_on: '2019-06-01', use_by: '2020-01-01' })
    const later = await fx.lot({ lot_code: `${fx.tag}-NEW`, received_on: '2026-02-01', use_by: '2999-01-01' })
    const earlier = await fx.lot({ lot_code: `${fx.tag}-MID`, received_on: '2026-01-15', use_by: null })
    const p = await plannedPour('2028-05-05T09:00:00Z')
    const r = await startMixing(p.id, { waterTempC: 18 })
    expect(r.status, JSON.stringify(r.data)).toBe(200)
    const mine = r.data.card.lots.filter((l: { id: number }) => [expired, later, earlier].includes(l.id))
    expect(mine.map((l: { id: number }) => l.id)).toEqual([earlier, later, expired])
    expect(mine.map((l: { expired: boolean }) => l.expired)).toEqual([false, false, true])
    expect(mine[2].useBy).toBe('2020-01-01')
  })
})
