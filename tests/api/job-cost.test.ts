// A job's actual cost against its estimate from the API: pours and finishing steps taken through
// the floor and finishing routes, the clock's rules, the roll-up per item and in total, and who may
// read it (another workshop's job 404, a client and a caster refused). The pours' casting times are
// set on the rows (the register stays as the tablets wrote it) so the arithmetic is exact.
import { randomUUID } from 'node:crypto'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { call, signIn } from '../setup/http'
import { DEMO_PASSWORD, closeTestDb, demo, makeOtherWorkshop } from '../setup/fixtures'
import { finishingFixture } from '../setup/finishing-fixtures'

let fx: Awaited<ReturnType<typeof finishingFixture>>
let finisher = ''
const MIN = 60_000

beforeAll(async () => {
  fx = await finishingFixture('cost')
  finisher = await signIn(demo.finisher.email, DEMO_PASSWORD)
})
afterAll(closeTestDb)

const act = (pieceId: number, body: Record<string, unknown>, cookie = finisher) =>
  call(`/api/pieces/${pieceId}/actions`, { method: 'POST', cookie, body: { actionId: randomUUID(), ...body } })
const cost = (jobId: number, cookie = fx.lead) => call(`/api/jobs/${jobId}/cost`, { cookie })

/**
 * Our own worked example, priced by hand here. Labour £30.00 an hour (3000 p); a lot of 25 kg bags
 * at £18.50 (1850 p). Item X (estimate £100.00) and item Y (estimate £20.00), each one pour of
 * 2.9 kg (the fixture's batch): 2.9 × 1850 / 25 = 214.6 → 215 p each.
 * Casting, one caster: X mixed 08:00, demoulded 08:50, clean-out 10 min → 08:00–09:00; Y 08:30–09:30.
 * 08:00–08:30 X alone, 08:30–09:00 shared (15 min each), 09:00–09:30 Y alone: 45 min each →
 * 0.75 h × 3000 = 2250 p each.
 * Fettling X: the finisher 20 min, then the lead 5 min to 'fettled': 25 min → 1250 p.
 * Repair Y: the finisher 30 min → 1500 p.
 * Mould-making: 2.5 h on X's new mould, which only X casts in → 7500 p.
 * X: 215 + 2250 + 1250 + 7500 = 11215 p (+1215 on its estimate); Y: 215 + 2250 + 1500 = 3965 p
 * (+1965); total 15180 p against the accepted quote's £150.00: +180 p.
 */
describe('the cost roll-up', () => {
  let jobId = 0
  let x: Awaited<ReturnType<typeof fx.piece>>
  let y: Awaited<ReturnType<typeof fx.piece>>

  beforeAll(async () => {
    await fx.k('workshop_rates').insert({ workshop_id: fx.workshopId, labour_per_hour: 3000 })
      .onConflict('workshop_id').merge(['labour_per_hour'])
    jobId = await fx.job()
    const mx = await fx.mould()
    const my = await fx.mould()
    const itemX = await fx.item(jobId, mx, { estimate_minor: 10000 })
    const itemY = await fx.item(jobId, my, { estimate_minor: 2000 })
    x = await fx.piece({ itemId: itemX, mouldId: mx })
    y = await fx.piece({ itemId: itemY, mouldId: my, result: 'defect' })
    const lot = await fx.lot({ price_per_bag: 1850 })
    const day = '2019-06-03'
    await fx.k('pours').where({ id: x.pourId }).update({ lot_id: lot, mixing_at: `${day}T08:00:00Z`, demoulded_at: `${day}T08:50:00Z` })
    await fx.k('pours').where({ id: y.pourId }).update({ lot_id: lot, mixing_at: `${day}T08:30:00Z`, demoulded_at: `${day}T09:20:00Z` })
    const [q] = await fx.k('quotes').insert({ workshop_id: fx.workshopId, number: 9001, title: 'Cost test', job_id: jobId }).returning('id')
    await fx.k('quote_versions').insert({
      workshop_id: fx.workshopId, quote_id: q.id, revision: 1, status: 'accepted', take_off: '{}', lines: '[]', currency: 'GBP',
      net: 20000, tax: 0, total: 20000, estimate: 15000, deposit: 0, decided_at: new Date(),
    })
  })

  it('times fettling and repair with start and stop, refusing a stop with no clock and a second start of one\'s own', async () => {
    const base = Date.now()
    const ago = (m: number) => new Date(base - m * MIN).toISOString()
    expect((await act(x.id, { kind: 'fettle_stop', version: 1, at: ago(70) })).status).toBe(409)
    const started = await act(x.id, { kind: 'fettle_start', version: 1, at: ago(60) })
    expect(started.status, JSON.stringify(started.data)).toBe(200)
    expect(started.data.piece).toMatchObject({ state: 'to_fettle', version: 2, timer: { work: 'fettle', since: ago(60) } })
    expect((await act(x.id, { kind: 'fettle_start', version: 2, at: ago(55) })).status).toBe(409)
    expect((await act(x.id, { kind: 'repair_start', version: 2, at: ago(55) })).status).toBe(409)
    expect((await act(x.id, { kind: 'fettle_stop', version: 2, at: ago(40) })).data.piece.timer).toBeNull()
    expect((await act(x.id, { kind: 'fettle_start', version: 3, at: ago(30) }, fx.lead)).status).toBe(200)
    const fettled = await act(x.id, { kind: 'fettled', version: 4, at: ago(25) }, fx.lead)
    expect(fettled.status, JSON.stringify(fettled.data)).toBe(200)

    expect((await act(y.id, { kind: 'repair_start', version: 1, at: ago(50) })).status).toBe(200)
    expect((await act(y.id, { kind: 'repair_stop', version: 2, at: ago(20) })).status).toBe(200)
  })

  it('prices plaster, casting, finishing and mould-making per item and in total, against the estimate', async () => {
    const work = await call(`/api/moulds/${x.mouldId}/work`, {
      method: 'PUT', cookie: fx.lead,
      body: { kind: 'new', startedOn: '2019-05-01', availableFrom: '2019-05-20', state: 'done', assignedTo: null, stages: [{ stage: 'mould', leadDays: 3, done: true, hours: 2.5 }] },
    })
    expect(work.status, JSON.stringify(work.data)).toBe(200)
    expect(work.data.stages[0].hours).toBe(2.5)

    const r = await cost(jobId)
    expect(r.status, JSON.stringify(r.data)).toBe(200)
    expect(r.data.items.map(({ description: _d, ...i }: Record<string, unknown>) => i)).toEqual([
      { itemId: x.itemId, plaster: 215, casting: 2250, fettling: 1250, repair: 0, mouldMaking: 7500, total: 11215, estimate: 10000, difference: 1215 },
      { itemId: y.itemId, plaster: 215, casting: 2250, fettling: 0, repair: 1500, mouldMaking: 0, total: 3965, estimate: 2000, difference: 1965 },
    ])
    expect(r.data.total).toEqual({ plaster: 430, casting: 4500, fettling: 1250, repair: 1500, mouldMaking: 7500, total: 15180, estimate: 15000, difference: 180 })
    expect(r.data).toMatchObject({ currency: 'GBP', labourPerHour: 3000, quote: { number: 9001, revision: 1 }, unpricedPours: 0, running: 0 })
    const byName = Object.fromEntries(r.data.people.map((p: { name: string }) => [p.name, p]))
    expect(byName[fx.casterName]).toMatchObject({ castingMinutes: 90 })
    expect(byName['Teodor Valance']).toMatchObject({ fettlingMinutes: 20, repairMinutes: 30 })
  })

  it('says "no estimate" for a job without an accepted quote', async () => {
    const bare = await fx.job()
    await fx.item(bare, null)
    const r = await cost(bare)
    expect(r.status).toBe(200)
    expect(r.data.total).toMatchObject({ total: 0, estimate: null, difference: null })
    expect(r.data.quote).toBeNull()
  })

  it('is the lead\'s alone: another workshop\'s job is a 404, a client and a caster are refused', async () => {
    const other = await makeOtherWorkshop()
    expect((await cost(other.jobId)).status).toBe(404)
    const client = await signIn(demo.client1.email, DEMO_PASSWORD)
    expect((await cost(jobId, client)).status).toBe(403)
    expect((await cost(jobId, fx.caster)).status).toBe(403)
  })
})
