// The board read, shop conditions and the day sheet: shapes, ranges, overdue, roles, tenancy.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { baseUrl, call, signIn } from '../setup/http'
import { DEMO_PASSWORD, closeTestDb, demo, makeOtherWorkshop } from '../setup/fixtures'
import { boardFixture } from '../setup/board-fixtures'
import { expandBoardPours, leanPour } from '#shared/utils/board-lean'

// April 2027 is BST (UTC+1): local 09:00 is 08:00Z. Days far from the demo's and other files'.
const local = (day: string, hhmm: string) => `${day}T${hhmm}:00+01:00`
let lead = ''
let fx: Awaited<ReturnType<typeof boardFixture>>

beforeAll(async () => {
  lead = await signIn(demo.lead.email, DEMO_PASSWORD)
  fx = await boardFixture('board')
})
afterAll(closeTestDb)

const post = (body: Record<string, unknown>) => call('/api/pours', { method: 'POST', cookie: lead, body })
/** GET /api/board with its lean pours kept as `rows`, named as `wire` (leanPour) and expanded as the board page does into `pours`. */
const board = async (from: string, to: string, cookie = lead) => {
  const r = await call(`/api/board?from=${from}&to=${to}`, { cookie })
  if (r.status === 200) r.data = { ...r.data, rows: r.data.pours, wire: r.data.pours.map(leanPour), pours: expandBoardPours(r.data) }
  return r
}

describe('GET /api/board', () => {
  it('returns the calendar, benches, moulds, the range\'s non-void pours, items and casters', async () => {
    const mouldId = await fx.mould()
    const worn = await fx.mould({ pulls: 95, expected_pulls: 100 })
    const job = await fx.job()
    const item = await fx.item(job, mouldId, { pieces_needed: 5 })
    const waiting = await fx.item(await fx.job({ sample_required: true, sample_state: 'awaiting_cast' }), worn)
    const inside = (await post({ mouldId, slotStart: local('2027-04-05', '09:00'), jobItemId: item, casterId: fx.casterId })).data
    await post({ mouldId, slotStart: local('2027-04-08', '09:00'), jobItemId: item })
    const voided = (await post({ mouldId, slotStart: local('2027-04-06', '09:00'), jobItemId: item })).data
    await call(`/api/pours/${voided.id}/void`, { method: 'POST', cookie: lead, body: { version: 1, reason: 'test' } })
    const r = await board('2027-04-05', '2027-04-06')
    expect(r.status).toBe(200)
    expect(r.data.workshop).toMatchObject({ timezone: 'Europe/London', shiftStart: '07:30', shiftEnd: '16:00', workingDays: [1, 2, 3, 4, 5], units: 'metric' })
    expect(typeof r.data.workshop.defaultShopTempC).toBe('number')
    // the board's humidity field starts from the workshop's usual, not a constant
    expect(r.data.workshop.defaultHumidityPct).toBe(Number((await fx.k('workshops').where({ id: fx.workshopId }).first('default_humidity_pct')).default_humidity_pct))
    expect(r.data.benches).toContainEqual({ id: fx.benchId, name: expect.any(String), sortOrder: 90 })
    const mine = r.data.pours.filter((p: { mouldId: number }) => p.mouldId === mouldId)
    expect(mine.map((p: { id: number }) => p.id)).toEqual([inside.id])
    // the expanded lean row is exactly the pour the write route answered with
    expect(mine[0]).toEqual({ ...inside, overdue: false, situation: 'waiting' })
    // on the wire: one array of values per pour, ids and epoch ms, the names once in the lookups
    const row = r.data.rows.find((p: unknown[]) => p[0] === inside.id)
    expect(row).toHaveLength(19)
    expect(row.filter((v: unknown) => typeof v === 'string')).toEqual(['planned'])
    const wire = r.data.wire.find((p: { id: number }) => p.id === inside.id)
    expect(wire).not.toHaveProperty('mouldCode')
    expect(wire).not.toHaveProperty('jobCode')
    expect(wire.t).toEqual([inside.slotStart, inside.slotEnd, inside.mixAt, inside.demouldOpenAt, inside.demouldCloseAt].map(Date.parse))
    expect(r.data.lookups.jobs[job]).toBe(inside.jobCode)
    expect(r.data.lookups.items[item]).toEqual({ jobId: job, description: inside.itemDescription })
    expect(r.data.lookups.people[fx.casterId]).toBe(fx.casterName)
    const moulds = new Map(r.data.moulds.map((m: { id: number }) => [m.id, m]))
    expect(moulds.get(mouldId)).toMatchObject({ benchId: fx.benchId, state: 'ready', pulls: 0, expectedPulls: 100, lifeFlag: false })
    expect(moulds.get(worn)).toMatchObject({ lifeFlag: true })
    // in the calendar's row order (bench name, then code), which the server's sketch draws as sent
    const rows = r.data.moulds.map((m: { benchName: string | null; code: string }) => [m.benchName ?? 'No bench', m.code] as const)
    expect(rows).toEqual([...rows].sort((a, b) => a[0].localeCompare(b[0]) || a[1].localeCompare(b[1])))
    const items = new Map(r.data.jobItems.map((i: { id: number }) => [i.id, i]))
    expect(items.get(item)).toMatchObject({ jobId: job, mouldId, piecesNeeded: 5, piecesPlanned: 2, released: true })
    expect(items.get(waiting)).toMatchObject({ released: false })
    expect(r.data.casters).toContainEqual({ id: fx.casterId, name: fx.casterName })
    expect(r.data.shopDays).toEqual([])
  })

  it('includes a pour that starts before the range but runs into it', async () => {
    const mouldId = await fx.mould({ max_dwell_minutes: 900 })
    const late = (await post({ mouldId, slotStart: local('2027-04-13', '23:40') })).data
    const r = await board('2027-04-14', '2027-04-14')
    expect(r.data.pours.map((p: { id: number }) => p.id)).toContain(late.id)
  })

  it('names a never-mixed pour past its time a missed start and a cast past its window an overdue demould', async () => {
    const mouldId = await fx.mould({ max_dwell_minutes: 30 })
    const past = (await post({ mouldId, slotStart: '2025-06-02T09:00:00+01:00' })).data
    expect(past).toMatchObject({ overdue: false, situation: 'missed_start' })
    expect(past.warnings[0]).toMatch(/^Missed start: never mixed; the mix was due at Mon 2 Jun 2025 09:\d\d/)
    await fx.k('pours').where({ id: past.id }).update({ state: 'setting', mixing_at: past.mixAt, poured_at: past.mixAt })
    const r = await board('2025-06-02', '2025-06-02')
    const seen = r.data.pours.find((p: { id: number }) => p.id === past.id)
    expect(seen).toMatchObject({ overdue: true, situation: 'overdue_demould' })
    expect(seen.warnings.join(' ')).not.toContain('Missed start')
  })

  it('refuses a range over 31 days or a bad day, naming the field', async () => {
    for (const [q, field] of [['from=2027-01-01&to=2027-02-01', 'query.to'], ['from=2027-01-05&to=2027-01-04', 'query.to'],
      ['from=soon&to=2027-01-04', 'query.from'], ['to=2027-01-04', 'query.from']] as const) {
      const r = await call(`/api/board?${q}`, { cookie: lead })
      expect(r.status, q).toBe(422)
      expect(r.data.data.problems[0].field).toBe(field)
    }
    expect((await board('2027-01-01', '2027-01-31')).status).toBe(200)
  })

  it('staff read it, clients do not; another workshop sees none of these pours', async () => {
    for (const who of [demo.caster1, demo.finisher]) expect((await board('2027-04-05', '2027-04-06', await signIn(who.email, DEMO_PASSWORD))).status).toBe(200)
    expect((await board('2027-04-05', '2027-04-06', await signIn(demo.client1.email, DEMO_PASSWORD))).status).toBe(403)
    const other = await makeOtherWorkshop()
    const theirs = await board('2027-04-05', '2027-04-06', await signIn(other.lead.email, DEMO_PASSWORD))
    expect(theirs.status).toBe(200)
    expect(theirs.data.pours).toEqual([])
    expect(theirs.data.moulds).toEqual([])
    expect(theirs.data.casters.map((c: { name: string }) => c.name)).toEqual(['Fixture other-caster', 'Fixture other-lead'])
  })
})

describe('shop days', () => {
  it('a colder day re-times that day\'s planned pours, keeping their prep start', async () => {
    const [a, b] = [await fx.mould(), await fx.mould()]
    const p1 = (await post({ mouldId: a, slotStart: local('2027-04-12', '09:00') })).data
    const p2 = (await post({ mouldId: b, slotStart: local('2027-04-12', '10:00') })).data
    const r = await call('/api/shop-days/2027-04-12', { method: 'PUT', cookie: lead, body: { tempC: 8, humidityPct: 70 } })
    expect(r.status).toBe(200)
    expect(r.data).toEqual({ day: '2027-04-12', tempC: 8, humidityPct: 70, moved: 2 })
    const after = (await board('2027-04-12', '2027-04-12')).data
    for (const before of [p1, p2]) {
      const now = after.pours.find((p: { id: number }) => p.id === before.id)
      expect(now.slotStart).toBe(before.slotStart)
      expect(now.version).toBe(2)
      expect(Date.parse(now.demouldOpenAt)).toBeGreaterThan(Date.parse(before.demouldOpenAt))
    }
    expect(after.shopDays).toEqual([{ day: '2027-04-12', tempC: 8, humidityPct: 70 }])
    const again = await call('/api/shop-days/2027-04-12', { method: 'PUT', cookie: lead, body: { tempC: 8, humidityPct: 60 } })
    expect(again.data.moved).toBe(0)
    const list = await call('/api/shop-days?from=2027-04-01&to=2027-04-30', { cookie: lead })
    expect(list.data).toEqual([{ day: '2027-04-12', tempC: 8, humidityPct: 60 }])
  })

  it('a pour that would now run into the next one on its mould is kept with a warning', async () => {
    const m = await fx.mould()
    const first = (await post({ mouldId: m, slotStart: local('2027-04-15', '09:00') })).data
    const next = (await post({ mouldId: m, slotStart: first.slotEnd })).data
    expect(next.slotStart).toBe(first.slotEnd)
    const r = await call('/api/shop-days/2027-04-15', { method: 'PUT', cookie: lead, body: { tempC: 6, humidityPct: 70 } })
    expect(r.status).toBe(200)
    const pours = (await board('2027-04-15', '2027-04-15')).data.pours
    const f = pours.find((p: { id: number }) => p.id === first.id)
    expect(f.slotEnd).toBe(next.slotStart)
    expect(f.warnings.join(' ')).toContain('move one of them')
  })

  it('names bad fields; only a lead enters conditions', async () => {
    for (const [path, body, field] of [['/api/shop-days/2027-04-16', { tempC: 90, humidityPct: 50 }, 'tempC'],
      ['/api/shop-days/2027-04-16', { tempC: 10 }, 'humidityPct'], ['/api/shop-days/2027-02-30', { tempC: 10, humidityPct: 50 }, 'params.day']] as const) {
      const r = await call(path, { method: 'PUT', cookie: lead, body })
      expect(r.status, field).toBe(422)
      expect(r.data.data.problems[0].field).toBe(field)
    }
    const caster = await signIn(demo.caster1.email, DEMO_PASSWORD)
    expect((await call('/api/shop-days/2027-04-16', { method: 'PUT', cookie: caster, body: { tempC: 10, humidityPct: 50 } })).status).toBe(403)
    expect((await call('/api/shop-days?from=2027-04-01&to=2027-04-30', { cookie: caster })).status).toBe(200)
  })
})

describe('day sheet', () => {
  it('lists the day\'s pours by bench and the plaster to fetch, with the lot to open first', async () => {
    const [a, b] = [await fx.mould(), await fx.mould({ bench_id: null })]
    const job = await fx.job()
    const item = await fx.item(job, a)
    const oldest = await fx.lot({ received_on: '2019-01-02', use_by: null, bags_received: 4 })
    const p1 = (await post({ mouldId: a, slotStart: local('2027-04-20', '09:00'), jobItemId: item, casterId: fx.casterId })).data
    const p2 = (await post({ mouldId: b, slotStart: local('2027-04-20', '10:00') })).data
    const r = await call('/api/day-sheet?day=2027-04-20', { cookie: lead })
    expect(r.status).toBe(200)
    expect(r.data.day).toBe('2027-04-20')
    const bench = r.data.benches.find((x: { benchId: number }) => x.benchId === fx.benchId)
    expect(bench.pours).toEqual([expect.objectContaining({
      id: p1.id, mouldCode: p1.mouldCode, casts: expect.any(String), jobCode: p1.jobCode, itemDescription: p1.itemDescription,
      casterName: fx.casterName, mixAt: p1.mixAt, demouldOpenAt: p1.demouldOpenAt, demouldCloseAt: p1.demouldCloseAt,
      gradeName: p1.gradeName, consistency: 70, plasterKg: p1.plasterKg, waterKg: p1.waterKg,
    })])
    const loose = r.data.benches.find((x: { benchId: number | null }) => x.benchId === null)
    expect(loose.pours.map((p: { id: number }) => p.id)).toContain(p2.id)
    const line = r.data.requisition.find((l: { gradeId: number }) => l.gradeId === fx.gradeId)
    const kg = p1.plasterKg + (p2.gradeId === fx.gradeId ? p2.plasterKg : 0)
    expect(line.plasterKg).toBeCloseTo(kg, 6)
    expect(line.bags).toBe(Math.ceil(kg / 25))
    expect(line.bagKg).toBe(25)
    expect(line.lotToOpen).toMatchObject({ lotId: oldest, useBy: null, stockKg: 100 })
  })

  it('exports the sheet as a CSV attachment', async () => {
    const m = await fx.mould()
    const p = (await post({ mouldId: m, slotStart: local('2027-04-21', '09:00') })).data
    const res = await fetch(`${baseUrl()}/api/day-sheet/export?day=2027-04-21`, { headers: { cookie: lead } })
    expect(res.status).toBe(200)
    expect(res.headers.get('content-type')).toContain('text/csv')
    expect(res.headers.get('content-disposition')).toContain('attachment; filename="day-sheet-2027-04-21.csv"')
    const text = await res.text()
    expect(text.split('\n')[0]).toContain('section,bench,mould')
    expect(text).toContain(p.mouldCode)
    expect(text).toContain('requisition')
  })

  it('a caster reads it; a finisher does not; a bad day is a 422', async () => {
    expect((await call('/api/day-sheet?day=2027-04-20', { cookie: await signIn(demo.caster1.email, DEMO_PASSWORD) })).status).toBe(200)
    expect((await call('/api/day-sheet?day=2027-04-20', { cookie: await signIn(demo.finisher.email, DEMO_PASSWORD) })).status).toBe(403)
    const bad = await call('/api/day-sheet?day=20-04-2027', { cookie: lead })
    expect(bad.status).toBe(422)
    expect(bad.data.data.problems[0].field).toBe('query.day')
  })
})

describe('GET /api/overview (Today)', () => {
  interface Line { kind: string; text: string; to: string; at: string | null }
  const today = async () => {
    const r = await call('/api/overview', { cookie: lead })
    expect(r.status).toBe(200)
    return r.data as { workshop: string; timezone: string; lines: Line[]; poursTodayByState: Record<string, number> }
  }
  const lineWith = (lines: Line[], text: string) => lines.find(l => l.text.includes(text))

  it('lists what needs the lead now, each line linking to where it is dealt with', async () => {
    const mouldId = await fx.mould({ max_dwell_minutes: 600 })
    const mouldCode = (await fx.k('moulds').where({ id: mouldId }).first('code')).code as string
    const job = await fx.job({ due_on: '2027-04-01' })
    const jobCode = (await fx.k('jobs').where({ id: job }).first('code')).code as string
    const item = await fx.item(job, mouldId, { pieces_needed: 2 })
    // a pour that should have started three hours ago, still planned
    const missed = (await post({ mouldId, slotStart: new Date(Date.now() - 3 * 3_600_000).toISOString(), jobItemId: item })).data
    // a pour on the board after the job's due date: projected late
    await post({ mouldId, slotStart: local('2027-04-05', '09:00'), jobItemId: item })
    const settingMould = await fx.mould()
    const setting = (await post({ mouldId: settingMould, slotStart: '2026-01-05T09:00:00Z' })).data
    await fx.k('pours').where({ id: setting.id }).update({ state: 'setting' })
    const repair = await fx.mould({ state: 'repair' })
    const worn = await fx.mould({ pulls: 96, expected_pulls: 100 })
    const stale = await fx.lot({ use_by: '2026-01-02' })
    const short = await fx.lot({ bags_received: 1 })
    const healthy = await fx.lot({ use_by: '2999-01-01' })
    const sample = await fx.job({ sample_required: true, sample_state: 'changes_requested' })

    const { lines } = await today()
    const missedLine = lineWith(lines, `${jobCode} on ${mouldCode} missed its start`)
    expect(missedLine).toMatchObject({ kind: 'missed-start', at: missed.slotStart })
    const localDay = new Intl.DateTimeFormat('en-CA', { timeZone: 'Europe/London' }).format(new Date(missed.slotStart))
    expect(missedLine!.to).toBe(`/lead/board?view=day&date=${localDay}`)
    const settingCode = (await fx.k('moulds').where({ id: settingMould }).first('code')).code as string
    expect(lines.find(l => l.kind === 'demould-overdue' && l.text.includes(`on ${settingCode}`)))
      .toMatchObject({ to: '/lead/board?view=day&date=2026-01-05' })
    expect(lineWith(lines, `${jobCode} projected late`)).toMatchObject({ kind: 'job-late', to: `/lead/jobs/${job}`, at: '2027-04-05' })
    // the house day style, en-GB (shared/utils/workshop-format.ts); 1 Apr 2027 is a Thursday (Gregorian calendar)
    expect(lineWith(lines, `${jobCode} projected late`)!.text).toContain('due Thu 1 Apr 2027, last demould on the board Mon 5 Apr 2027')
    const lotCode = async (id: number) => (await fx.k('plaster_lots').where({ id }).first('lot_code')).lot_code as string
    expect(lineWith(lines, `Lot ${await lotCode(stale)} is past its use-by`)).toMatchObject({ kind: 'lot', to: '/lead/lots' })
    // one bag of 25 kg received, nothing used: under the two bags' worth Today warns at
    expect(lineWith(lines, `Lot ${await lotCode(short)} is running short: 25 kg left`)).toMatchObject({ kind: 'lot' })
    expect(lineWith(lines, `Lot ${await lotCode(healthy)}`)).toBeUndefined()
    const mouldCodeOf = async (id: number) => (await fx.k('moulds').where({ id }).first('code')).code as string
    expect(lineWith(lines, `Mould ${await mouldCodeOf(repair)} is waiting for repair`)).toMatchObject({ kind: 'mould', to: `/lead/moulds/${repair}` })
    expect(lineWith(lines, `Mould ${await mouldCodeOf(worn)} is near the end of its life: 96 of 100 pulls`)).toMatchObject({ to: `/lead/moulds/${worn}` })
    const sampleCode = (await fx.k('jobs').where({ id: sample }).first('code')).code as string
    expect(lineWith(lines, `${sampleCode}: the client asked for changes`)).toMatchObject({ kind: 'sample', to: `/lead/jobs/${sample}` })

    // cast on time: the missed-start line goes
    await fx.k('pours').where({ id: missed.id }).update({ state: 'mixing' })
    expect(lineWith((await today()).lines, `${jobCode} on ${mouldCode} missed its start`)).toBeUndefined()
  })

  it('shows nothing of another workshop, and only to the lead', async () => {
    const other = await makeOtherWorkshop()
    await fx.k('moulds').insert({ workshop_id: other.workshopId, code: 'OTHER-REPAIR', casts: 'x', material: 'silicone', cavity_litres: 1, state: 'repair' })
    expect((await today()).lines.some(l => l.text.includes('OTHER-REPAIR'))).toBe(false)
    const caster = await signIn(demo.caster1.email, DEMO_PASSWORD)
    expect((await call('/api/overview', { cookie: caster })).status).toBe(403)
  })
})
