/**
 * CSV import preview of 5,000 moulds (plain tsx script; `npm run bench` runs it): an invented
 * mould list in the export's columns goes through the real route (POST
 * /api/import/moulds/preview, multipart, as the lead) of a built server of its own; the time to
 * the full preview (every row checked against the workshop's codes and benches) is printed.
 * Goal: under 3 s. The job-items half of the issue's figure waits for the job import. Prints
 * figures; never asserts.
 */
import { performance } from 'node:perf_hooks'
import { benchDatabase, DEMO_PASSWORD, DEMO_USERS, signIn, startBenchServer } from './lib/app'
import { record } from './lib/results'

const MOULDS = 5000
const RUNS = 3
const GOAL_S = 3

function csv() {
  const lines = ['code,casts,material,bench,cavity (L),cast length (m),prep (min),clean-out (min),maximum dwell (min),pulls,expected pulls,state,state reason']
  const materials = ['silicone', 'polyurethane', 'grp_case', 'plaster_piece', 'gelatine']
  for (let i = 0; i < MOULDS; i++) {
    lines.push(`BM-${String(i).padStart(5, '0')},Bench cornice ${i},${materials[i % 5]},,${(1 + (i % 40) / 10).toFixed(1)},${i % 3 ? '' : '1.2'},10,10,120,${i % 50},200,ready,`)
  }
  return lines.join('\n')
}

async function main() {
  const file = csv()
  const db = await benchDatabase()
  const app = await startBenchServer(db.url)
  try {
    const lead = await signIn(app.url, DEMO_USERS.find(u => u.key === 'lead')!.email, DEMO_PASSWORD)
    const times: number[] = []
    for (let i = 0; i < RUNS; i++) {
      const form = new FormData()
      form.append('file', new Blob([file], { type: 'text/csv' }), 'moulds.csv')
      const t0 = performance.now()
      const r = await fetch(`${app.url}/api/import/moulds/preview`, { method: 'POST', headers: { cookie: lead }, body: form })
      const body = await r.json() as { rowCount: number; problemRows: number }
      times.push(performance.now() - t0)
      if (r.status !== 200 || body.rowCount !== MOULDS) throw new Error(`preview answered ${r.status}: ${JSON.stringify(body).slice(0, 300)}`)
    }
    const best = Math.min(...times) / 1000
    console.log(`import preview: ${MOULDS} moulds, ${(file.length / 1024).toFixed(0)} KB CSV, ${RUNS} runs`)
    console.log(`  answered in ${times.map(t => `${(t / 1000).toFixed(2)} s`).join(', ')}   (goal < ${GOAL_S} s)`)
    record({ name: `import preview, ${MOULDS} moulds`, value: `${best.toFixed(2)} s`, target: `< ${GOAL_S} s`, met: best < GOAL_S, note: `${(file.length / 1024).toFixed(0)} KB CSV, best of ${RUNS}` })
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
