/**
 * CSV import preview of 5,000 moulds and of 2,000 open-job items (plain tsx script; `npm run
 * bench` runs it): invented files in the exports' columns go through the real routes (POST
 * /api/import/moulds/preview and /api/import/jobs/preview, multipart, as the lead) of a built
 * server of its own; the time to the full preview (every row checked against the workshop's
 * codes, benches, clients, sites, moulds and grades; runs through the run calculator) is
 * printed. Goal: under 3 s each. Prints figures; never asserts.
 */
import { performance } from 'node:perf_hooks'
import { benchDatabase, DEMO_PASSWORD, DEMO_USERS, signIn, startBenchServer } from './lib/app'
import { record } from './lib/results'

const MOULDS = 5000
const ITEMS = 2000
const ITEMS_PER_JOB = 5
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

/** Open jobs with their items: pieces by profile, and every fifth item a run on a run mould of the demo. */
function jobsCsv(runMould: string) {
  const lines = ['job,title,client,site,site note,due on,sample,job notes,item,mould,profile,quantity,walls (m),shortest piece (m),spares (%),grade,consistency']
  for (let i = 0; i < ITEMS; i++) {
    const job = Math.floor(i / ITEMS_PER_JOB)
    const first = i % ITEMS_PER_JOB === 0
    const own = first ? `Bench job ${job},,,Room ${job % 12},2027-0${1 + (job % 9)}-15,no,` : ',,,,,,'
    const item = i % 5 === 4 ? `Run ${i},${runMould},,,5.2 4.1 5.2 4.1,,5,,` : `Piece ${i},,Profile ${i % 30},${1 + (i % 12)},,,,,`
    lines.push(`BJ-${String(job).padStart(4, '0')},${own},${item}`)
  }
  return lines.join('\n')
}

async function timePreview(url: string, lead: string, kind: string, file: string, expectRows: number) {
  const times: number[] = []
  for (let i = 0; i < RUNS; i++) {
    const form = new FormData()
    form.append('file', new Blob([file], { type: 'text/csv' }), `${kind}.csv`)
    const t0 = performance.now()
    const r = await fetch(`${url}/api/import/${kind}/preview`, { method: 'POST', headers: { cookie: lead }, body: form })
    const body = await r.json() as { rowCount: number; problemRows: number }
    times.push(performance.now() - t0)
    if (r.status !== 200 || body.rowCount !== expectRows) throw new Error(`preview answered ${r.status}: ${JSON.stringify(body).slice(0, 300)}`)
    if (kind === 'jobs' && body.problemRows) throw new Error(`the bench's job file has ${body.problemRows} rows with problems: ${JSON.stringify(body).slice(0, 600)}`)
  }
  return times
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

    const moulds = await (await fetch(`${app.url}/api/moulds`, { headers: { cookie: lead } })).json() as { code: string; castLengthM: number | null }[]
    const runMould = moulds.find(m => m.castLengthM)
    if (!runMould) throw new Error('the demo has no run mould for the job items')
    const jobs = jobsCsv(runMould.code)
    const jobTimes = await timePreview(app.url, lead, 'jobs', jobs, ITEMS)
    const jobBest = Math.min(...jobTimes) / 1000
    console.log(`import preview: ${ITEMS} job items of ${ITEMS / ITEMS_PER_JOB} open jobs, ${(jobs.length / 1024).toFixed(0)} KB CSV, ${RUNS} runs`)
    console.log(`  answered in ${jobTimes.map(t => `${(t / 1000).toFixed(2)} s`).join(', ')}   (goal < ${GOAL_S} s)`)
    record({ name: `import preview, ${ITEMS} job items`, value: `${jobBest.toFixed(2)} s`, target: `< ${GOAL_S} s`, met: jobBest < GOAL_S, note: `${ITEMS / ITEMS_PER_JOB} jobs, every fifth item a run; ${(jobs.length / 1024).toFixed(0)} KB CSV, best of ${RUNS}` })
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
