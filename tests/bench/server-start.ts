/**
 * What one API or browser test file pays before its first test (plain tsx script; `npm run bench
 * -- server-start` runs it): a database cloned from the seeded template, then the built server
 * started on it until GET /api/health answers. Five starts one after another; prints the wall
 * time of the clone and of the start, and the server's own CPU seconds at that moment (user +
 * system from /proc/<pid>/stat, in clock ticks of 1/100 s as Linux reports them, proc(5)).
 * Never asserts: on a loaded machine wall time lies, CPU seconds less so.
 */
import { mkdtempSync, readFileSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { performance } from 'node:perf_hooks'
import { randomBytes } from 'node:crypto'
import { cloneFileDatabase } from '../setup/file-db'
import { startAppServer } from '../setup/server'
import { percentile } from './lib/stats'
import { record } from './lib/results'

const STARTS = 5
const TICKS_PER_SECOND = 100

function cpuSeconds(pid: number) {
  // fields 14 and 15 (utime, stime) of /proc/<pid>/stat, after the command name in parentheses
  const after = readFileSync(`/proc/${pid}/stat`, 'utf8').split(') ')[1]!.split(' ')
  return (Number(after[11]) + Number(after[12])) / TICKS_PER_SECOND
}

async function main() {
  const template = process.env.BENCH_DATABASE_URL
  if (!template) throw new Error('BENCH_DATABASE_URL is not set: run through npm run bench')
  const clone: number[] = []
  const start: number[] = []
  const cpu: number[] = []
  for (let i = 0; i < STARTS; i++) {
    const t0 = performance.now()
    const { databaseUrl, drop } = await cloneFileDatabase(template)
    const t1 = performance.now()
    const photoDir = mkdtempSync(join(tmpdir(), 'setline-bench-photos-'))
    const started = await startAppServer({ DATABASE_URL: databaseUrl, NUXT_SESSION_PASSWORD: randomBytes(24).toString('hex'), PHOTO_STORAGE_DIR: photoDir }, [], false)
    const t2 = performance.now()
    cpu.push(cpuSeconds(started.proc.pid!))
    clone.push(t1 - t0)
    start.push(t2 - t1)
    await new Promise(resolve => started.proc.once('exit', resolve).kill('SIGTERM'))
    rmSync(photoDir, { recursive: true, force: true })
    await drop()
  }
  const ms = (v: number) => `${Math.round(v)} ms`
  const line = (name: string, values: number[], format: (v: number) => string) => {
    const value = `${format(percentile(values, 50))} (max ${format(Math.max(...values))})`
    console.log(`${name}: ${value}`)
    record({ name, value, note: `median of ${STARTS} starts` })
  }
  line('test file: clone the template database', clone, ms)
  line('test file: built server start to /api/health', start, ms)
  line('test file: server CPU until /api/health', cpu, v => `${v.toFixed(2)} s`)
}

main().catch((err) => {
  console.error(err)
  process.exit(1)
})
