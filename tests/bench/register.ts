/**
 * Register CSV export speed (plain tsx script; `npm run bench` runs it through run.ts). A job of
 * the demo workshop gets 100,000 demoulded pours on a mould of its own, inserted in one statement
 * just before the export (so PostgreSQL has no statistics for them yet, as in the API test);
 * the lead downloads GET /api/jobs/[id]/register/export from a built server of its own. Prints
 * rows per second, the file size and the server's peak memory, beside one plain SELECT of the
 * same pours read whole by the bench (the floor of what any export could do). Never asserts.
 */
import { performance } from 'node:perf_hooks'
import { randomUUID } from 'node:crypto'
import knex from 'knex'
import { benchDatabase, DEMO_PASSWORD, DEMO_USERS, procKb, signIn, startBenchServer, watchPeakRss } from './lib/app'
import { mb } from './lib/stats'
import { record } from './lib/results'

const ROWS = 100_000
/** Hours from here on, on a mould of the bench's own: clear of every test's and bench's pours. */
const START = '2040-01-01T00:00:00Z'

async function seed(url: string) {
  const k = knex({ client: 'pg', connection: url, pool: { min: 0, max: 1 } })
  try {
    const lead = await k('users').where({ email: DEMO_USERS[0].email }).first('workshop_id')
    const ws = Number(lead.workshop_id)
    const tag = `bench-${randomUUID().slice(0, 6)}`
    const caster = await k('users').where({ email: DEMO_USERS.find(u => u.key === 'caster1')!.email }).first('id')
    const grade = await k('plaster_grades').where({ workshop_id: ws }).orderBy('id').first('id')
    const id = async (table: string, row: Record<string, unknown>) => Number((await k(table).insert({ workshop_id: ws, ...row }).returning('id'))[0].id)
    const mould = await id('moulds', { code: `${tag}-M`, casts: 'Benchmark cornice', material: 'silicone', cavity_litres: 2, prep_minutes: 10, clean_minutes: 10, max_dwell_minutes: 240 })
    const job = await id('jobs', { code: `${tag}-J`, title: 'Register benchmark' })
    const item = await id('job_items', { job_id: job, mould_id: mould, description: 'Benchmark lengths', pieces_needed: ROWS, grade_id: grade.id, consistency: 70 })
    const lot = await id('plaster_lots', { grade_id: grade.id, lot_code: `${tag}-L`, bags_received: 10, bag_kg: 25, received_on: '2026-01-01' })
    await k.raw(`INSERT INTO pours (workshop_id, job_item_id, mould_id, caster_id, grade_id, lot_id, consistency, slot, mix_at,
        demould_open_at, demould_close_at, state, plaster_kg_planned, water_kg_planned, plaster_kg_actual, water_kg_actual,
        shop_temp_c, water_temp_c, mixing_at, poured_at, demoulded_at, result, defect)
      SELECT :ws, :item, :mould, :caster, :grade, :lot, 70, tstzrange(t, t + interval '50 minutes'), t + interval '5 minutes',
        t + interval '30 minutes', t + interval '45 minutes', 'demoulded', 2, 1.4, 2, 1.4, 18, 18,
        t + interval '5 minutes', t + interval '8 minutes', t + interval '40 minutes',
        CASE WHEN s.i % 17 = 0 THEN 'defect' ELSE 'sound' END, CASE WHEN s.i % 17 = 0 THEN 'air holes' END
      FROM generate_series(0, :n - 1) AS s(i), LATERAL (SELECT CAST(:start AS timestamptz) + s.i * interval '1 hour' AS t) x`,
    { ws, item, mould, caster: caster.id, grade: grade.id, lot, n: ROWS, start: START })
    return { job, item }
  }
  finally {
    await k.destroy()
  }
}

async function main() {
  const db = await benchDatabase()
  const app = await startBenchServer(db.url)
  try {
    const lead = await signIn(app.url, DEMO_USERS[0].email, DEMO_PASSWORD)
    const { job, item } = await seed(db.url)
    const idleKb = procKb(app.pid, 'VmRSS')
    const watch = watchPeakRss(app.pid)
    const t0 = performance.now()
    const res = await fetch(`${app.url}/api/jobs/${job}/register/export`, { headers: { cookie: lead } })
    if (res.status !== 200) throw new Error(`export answered ${res.status}`)
    let lines = 0
    let bytes = 0
    for await (const chunk of res.body as unknown as AsyncIterable<Uint8Array>) {
      bytes += chunk.length
      for (const b of chunk) if (b === 10) lines++
    }
    const seconds = (performance.now() - t0) / 1000
    const peakKb = watch.stop()
    const k = knex({ client: 'pg', connection: db.url, pool: { min: 0, max: 1 } })
    const s0 = performance.now()
    const { rows } = await k.raw('SELECT p.* FROM pours p WHERE p.job_item_id = ? ORDER BY p.id', [item])
    const sqlSeconds = (performance.now() - s0) / 1000
    await k.destroy()
    const rate = (lines - 1) / seconds
    console.log(`register CSV export: ${lines - 1} rows, ${(bytes / 1e6).toFixed(1)} MB in ${seconds.toFixed(1)} s = ${rate.toFixed(0)} rows/s`)
    console.log(`  beside it: one SELECT of the same ${rows.length} pour rows read whole in ${sqlSeconds.toFixed(1)} s (${(rows.length / sqlSeconds).toFixed(0)} rows/s)`)
    console.log(`  server RSS ${mb(idleKb)} before, peak ${mb(peakKb)} during the export`)
    record({ name: 'register CSV export, 100,000 rows', value: `${seconds.toFixed(1)} s (${(rate / 1000).toFixed(1)}k rows/s)`, target: '< 5 s', met: seconds < 5, note: `${(bytes / 1e6).toFixed(1)} MB; plain SELECT of the pours ${sqlSeconds.toFixed(1)} s; server peak RSS ${mb(peakKb)}` })
  }
  finally {
    await app.stop()
    db.stop()
  }
}

main().catch((err) => {
  console.error(err)
  process.exit(1)
})
