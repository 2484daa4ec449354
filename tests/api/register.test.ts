// The casting register: the paged JSON with its filters, tenancy, validation, and a streamed
// CSV export of a job with 100,000 pours, watching the server's memory while it runs.
import { execFileSync } from 'node:child_process'
import { existsSync, readFileSync } from 'node:fs'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { baseUrl, call, signIn } from '../setup/http'
import { DEMO_PASSWORD, closeTestDb, demo, makeOtherWorkshop } from '../setup/fixtures'
import { boardFixture } from '../setup/board-fixtures'

let lead = ''
let fx: Awaited<ReturnType<typeof boardFixture>>
const t = { job: 0, mouldA: 0, mouldB: 0, lot: 0 }

/** Inserts `n` demoulded pours on one mould, one hour apart from `start`, in one statement. */
async function pours(n: number, mould: number, item: number, start: string, extra: { result?: string; caster?: number | null; shopTemp?: number } = {}) {
  await fx.k.raw(`INSERT INTO pours (workshop_id, job_item_id, mould_id, caster_id, grade_id, lot_id, consistency, slot, mix_at,
      demould_open_at, demould_close_at, state, plaster_kg_planned, water_kg_planned, plaster_kg_actual, water_kg_actual,
      shop_temp_c, water_temp_c, mixing_at, poured_at, demoulded_at, result, defect, predicted_demould_minutes)
    SELECT :ws, :item, :mould, :caster, :grade, :lot, 70, tstzrange(t, t + interval '50 minutes'), t + interval '5 minutes',
      t + interval '30 minutes', t + interval '45 minutes', 'demoulded', 2, 1.4, 2, 1.4, :temp, 18,
      t + interval '5 minutes', t + interval '8 minutes', t + interval '40 minutes', :result,
      CASE WHEN :result = 'defect' THEN 'air holes' END, 25
    FROM generate_series(0, :n - 1) AS s(i), LATERAL (SELECT CAST(:start AS timestamptz) + s.i * interval '1 hour' AS t) x`,
  { ws: fx.workshopId, item, mould, caster: extra.caster ?? fx.casterId, grade: fx.gradeId, lot: t.lot, temp: extra.shopTemp ?? 18, result: extra.result ?? 'sound', n, start })
}

beforeAll(async () => {
  lead = await signIn(demo.lead.email, DEMO_PASSWORD)
  fx = await boardFixture('register')
  t.job = await fx.job()
  t.mouldA = await fx.mould()
  t.mouldB = await fx.mould()
  t.lot = await fx.lot()
  const item = await fx.item(t.job, t.mouldA)
  await pours(3, t.mouldA, item, '2026-03-02T09:00:00Z')
  await pours(2, t.mouldB, item, '2026-03-05T09:00:00Z', { result: 'defect', caster: fx.caster2Id })
})
afterAll(closeTestDb)

describe('register', () => {
  it('pages a job\'s pours with times in the workshop zone, and filters by day, result, mould and caster', async () => {
    const all = await call(`/api/jobs/${t.job}/register?pageSize=2`, { cookie: lead })
    expect(all.status).toBe(200)
    expect(all.data).toMatchObject({ total: 5, page: 1, pageSize: 2 })
    expect(all.data.rows).toHaveLength(2)
    // 2026-03-02 09:05 UTC is 09:05 in Europe/London (GMT in March before the change)
    expect(all.data.rows[0]).toMatchObject({ mould: expect.any(String), mixingAt: '2026-03-02 09:05', result: 'sound', backdated: false, photos: 0 })
    expect(all.data.moulds.map((m: { id: number }) => m.id).sort()).toEqual([t.mouldA, t.mouldB].sort())
    const q = (s: string) => call(`/api/jobs/${t.job}/register?${s}`, { cookie: lead }).then(r => r.data.total)
    expect(await q('result=defect')).toBe(2)
    expect(await q(`mould=${t.mouldA}`)).toBe(3)
    expect(await q(`caster=${fx.caster2Id}`)).toBe(2)
    expect(await q('from=2026-03-03&to=2026-03-31')).toBe(2)
    for (const [s, field] of [['result=cracked', 'query.result'], ['from=2026-02-30', 'query.from'], ['pageSize=1000', 'query.pageSize'], ['from=2026-03-05&to=2026-03-01', 'query.to']]) {
      const bad = await call(`/api/jobs/${t.job}/register?${s}`, { cookie: lead })
      expect(bad.status, s).toBe(422)
      expect(bad.data.data.problems[0].field).toBe(field)
    }
  })

  it('another workshop\'s lead gets 404 for the register and its export', async () => {
    const other = await makeOtherWorkshop()
    const c = await signIn(other.lead.email, DEMO_PASSWORD)
    expect((await call(`/api/jobs/${t.job}/register`, { cookie: c })).status).toBe(404)
    expect((await call(`/api/jobs/${t.job}/register/export`, { cookie: c })).status).toBe(404)
  })

  it('exports the filtered register as CSV', async () => {
    const r = await call(`/api/jobs/${t.job}/register/export?result=defect`, { cookie: lead })
    expect(r.status).toBe(200)
    expect(r.headers.get('content-type')).toContain('text/csv')
    const lines = (r.data as string).trim().split('\n')
    expect(lines[0]).toContain('mixing (Europe/London)')
    expect(lines).toHaveLength(3)
    expect(lines[1]).toContain('air holes')
  })
})

describe('quality figures', () => {
  it('gives defect rates by mould, caster and temperature band, and the grade calibration', async () => {
    const [a, b] = [await fx.mould(), await fx.mould()]
    const item = await fx.item(t.job, a)
    await pours(4, a, item, '2029-02-05T09:00:00Z', { shopTemp: 22 })
    await pours(2, b, item, '2029-02-06T09:00:00Z', { result: 'defect', shopTemp: 8, caster: fx.caster2Id })
    const r = await call('/api/quality?from=2029-02-01&to=2029-02-28', { cookie: lead })
    expect(r.status).toBe(200)
    const codes = await fx.k('moulds').whereIn('id', [a, b]).orderBy('id').pluck('code')
    expect(r.data.byMould.filter((m: { key: string }) => codes.includes(m.key))).toEqual([
      { key: codes[0], pours: 4, defects: 0, rate: 0 }, { key: codes[1], pours: 2, defects: 2, rate: 1 },
    ])
    expect(r.data.byTemperature).toEqual(expect.arrayContaining([{ key: '< 10 °C', pours: 2, defects: 2, rate: 1 }, { key: '20–25 °C', pours: 4, defects: 0, rate: 0 }]))
    // predicted 25 min from the start of mixing (5 of them mixing), demoulded 35 min after it,
    // 10 min into the window (attended): set part 20 predicted, 30 actual, ratio 1.5
    const cal = r.data.calibration.find((c: { grade: string }) => c.grade === fx.grade.name)
    expect(cal).toMatchObject({ count: 6, predictedMinutes: 20, actualMinutes: 30 })
    expect(cal.factor).toBeCloseTo(1.5, 9)
    const bad = await call('/api/quality?from=2029-02-01&to=2031-02-28', { cookie: lead })
    expect(bad.status).toBe(422)
    expect(bad.data.data.problems[0].field).toBe('query.to')
    expect((await call('/api/quality?from=2029-02-01', { cookie: lead })).data.data.problems[0].field).toBe('query.to')
  })
})

/** The process listening on the app server's port. */
function serverPid() {
  const port = new URL(baseUrl()).port
  const out = execFileSync('ss', ['-ltnpH', `sport = :${port}`]).toString()
  return out.match(/pid=(\d+)/)?.[1]
}

/** Resident memory (kB) of a process. */
function serverMemory(pid: string) {
  if (!existsSync(`/proc/${pid}/status`)) return undefined
  const status = readFileSync(`/proc/${pid}/status`, 'utf8')
  const kb = (k: string) => Number(status.match(new RegExp(`${k}:\\s+(\\d+)`))?.[1])
  return { rssKb: kb('VmRSS') }
}

describe('register export at scale', () => {
  it('streams 100,000 pours as CSV without holding them in memory', { timeout: 300_000 }, async () => {
    const job = await fx.job()
    const mould = await fx.mould()
    await pours(100_000, mould, await fx.item(job, mould), '2030-01-01T00:00:00Z')
    const pid = serverPid()
    const before = pid ? serverMemory(pid) : undefined
    let peakKb = before?.rssKb ?? 0
    // only /proc/<pid>/status in the loop: `ss -p` walks every process's open files, and at ten a
    // second on a busy runner it held this file's event loop (and the download) for minutes
    const timer = setInterval(() => {
      peakKb = Math.max(peakKb, (pid && serverMemory(pid)?.rssKb) || 0)
    }, 100)
    const started = Date.now()
    const res = await fetch(`${baseUrl()}/api/jobs/${job}/register/export`, { headers: { cookie: lead } })
    expect(res.status).toBe(200)
    let newlines = 0
    let bytes = 0
    for await (const chunk of res.body as unknown as AsyncIterable<Uint8Array>) {
      bytes += chunk.length
      for (const b of chunk) if (b === 10) newlines++
    }
    clearInterval(timer)
    const seconds = (Date.now() - started) / 1000
    expect(newlines).toBe(100_001)
    const growthMb = before ? (peakKb - before.rssKb) / 1024 : NaN
    console.log(`register export: 100,000 rows, ${(bytes / 1e6).toFixed(1)} MB in ${seconds.toFixed(1)} s; server RSS ${((before?.rssKb ?? 0) / 1024).toFixed(0)} MB before, peak ${(peakKb / 1024).toFixed(0)} MB (growth ${growthMb.toFixed(0)} MB)`)
    // 100,000 rows of ~27 fields held as JS objects plus their CSV would take several hundred MB;
    // streamed, growth is one page plus garbage the collector has not yet reclaimed
    if (before) expect(growthMb).toBeLessThan(256)
  })
})
