/**
 * Planner benchmark (a plain script, run with tsx; `npm run bench` runs it through run.ts).
 * A synthetic workshop: 60 moulds on 6 benches, 20 working days, 2,000 pieces across 80 items
 * and 25 jobs, 40 existing pours and 4 casters, all from a seeded PRNG so every run plans the
 * same board. Prints the median and p95 of 5 timed runs after a warm-up; never asserts. A second
 * run lets every item use every mould, the planner's worst case for candidates per piece. A third
 * plans the real shop: the same 2,000 pieces over 60 moulds of 20 profiles (items name only a
 * profile), 8 casters with their own hours and absences, a holiday inside the 20 working days,
 * new moulds still being made and finish dates with drying.
 */
import { performance } from 'node:perf_hooks'
import { GRADE_PRESETS } from '#shared/utils/plaster'
import { planPours } from '#shared/utils/planner'
import type { PlanPoursInput, PlannerItem, PlannerMould } from '#shared/types/planner'
import { record } from './lib/results'
import { percentile } from './lib/stats'

const TARGET_MS = 1000
const RUNS = 5

/** mulberry32: a small, well-known seeded PRNG, enough for repeatable synthetic data. */
function prng(seed: number): () => number {
  let a = seed >>> 0
  return () => {
    a = (a + 0x6D2B79F5) >>> 0
    let t = a
    t = Math.imul(t ^ (t >>> 15), t | 1)
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61)
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296
  }
}

const rand = prng(20261202)
const int = (min: number, max: number) => min + Math.floor(rand() * (max - min + 1))

function buildMoulds(): PlannerMould[] {
  return Array.from({ length: 60 }, (_, i): PlannerMould => ({
    id: String(i + 1),
    code: `M${String(i + 1).padStart(3, '0')}`,
    benchId: String((i % 6) + 1),
    state: i % 29 === 28 ? 'repair' : 'ready',
    prepMinutes: int(8, 20),
    cleanMinutes: int(8, 15),
    maxDwellMinutes: rand() < 0.3 ? int(600, 1200) : int(60, 240),
    pulls: int(0, 200),
    expectedPulls: rand() < 0.8 ? int(300, 600) : null,
  }))
}

function buildItems(): PlannerItem[] {
  const grades = [GRADE_PRESETS['beta-casting'], GRADE_PRESETS['beta-fibrous'], GRADE_PRESETS['alpha-casting']]
  const items: PlannerItem[] = []
  let left = 2000
  for (let i = 0; i < 80; i++) {
    const pieces = i === 79 ? left : Math.min(left, int(10, 40))
    left -= pieces
    const job = i % 25
    const grade = grades[int(0, 2)]!
    const mould = int(1, 60)
    const alternatives = Array.from({ length: int(0, 2) }, () => String(int(1, 60)))
    items.push({
      itemId: String(i + 1),
      jobId: String(job + 1),
      jobCode: `J-${String(job + 1).padStart(3, '0')}`,
      dueOn: `2027-01-${String(8 + job).padStart(2, '0')}`,
      sampleReleased: job !== 24,
      piecesRemaining: pieces,
      mouldIds: [String(mould), ...alternatives],
      grade,
      consistency: grade.consistency.default,
    })
  }
  return items
}

function buildInput(): PlanPoursInput {
  const from = new Date('2027-01-04T00:00:00Z')
  const to = new Date('2027-02-01T00:00:00Z') // four weeks, Mon–Fri: 20 working days
  const shopTempByDay: Record<string, number> = {}
  for (let d = 4; d <= 31; d++) shopTempByDay[`2027-01-${String(d).padStart(2, '0')}`] = int(8, 22)
  const existingPours = Array.from({ length: 40 }, (_, i) => {
    const start = new Date(Date.UTC(2027, 0, 4 + (i % 5), 8 + (i % 6), 0))
    return { mouldId: String((i % 60) + 1), slotStart: start, slotEnd: new Date(start.getTime() + 60 * 60_000) }
  })
  return {
    calendar: { timezone: 'Europe/London', shiftStart: '07:30', shiftEnd: '16:00', workingDays: [1, 2, 3, 4, 5] },
    from,
    to,
    moulds: buildMoulds(),
    existingPours,
    items: buildItems(),
    shopTempByDay,
    defaultShopTempC: 15,
    options: { casters: ['c1', 'c2', 'c3', 'c4'] },
  }
}

/** The same pieces, but every item castable on every ready mould: the most candidates per piece. */
function wideInput(base: PlanPoursInput): PlanPoursInput {
  const all = base.moulds.map(m => m.id)
  return { ...base, items: base.items.map(i => ({ ...i, mouldIds: all })) }
}

/**
 * Wall-clock median and p95 of RUNS timed runs after a warm-up, plus the median CPU time of the
 * process (user + system), which a busy shared machine disturbs less than the wall clock.
 */
function measure(name: string, input: PlanPoursInput): void {
  planPours(input) // warm-up: JIT, Intl's zone data and the timing caches' first fill
  const wall: number[] = []
  const cpu: number[] = []
  let result = planPours(input)
  for (let r = 0; r < RUNS; r++) {
    const c0 = process.cpuUsage()
    const t0 = performance.now()
    result = planPours(input)
    wall.push(performance.now() - t0)
    const c = process.cpuUsage(c0)
    cpu.push((c.user + c.system) / 1000)
  }
  const pieces = input.items.reduce((s, i) => s + i.piecesRemaining, 0)
  const late = result.jobs.filter(j => !j.onTime).length
  console.log(`${name}: ${pieces} pieces, ${input.items.length} items, 25 jobs, ${input.moulds.length} moulds, 20 working days`)
  console.log(`  wall median ${percentile(wall, 50).toFixed(1)} ms, p95 ${percentile(wall, 95).toFixed(1)} ms; cpu median ${percentile(cpu, 50).toFixed(1)} ms; ${RUNS} runs (target: under ${TARGET_MS} ms)`)
  console.log(`  pours placed in range: ${result.pours.length}; jobs not on time: ${late}; unplaced items: ${result.unplaced.length}`)
  const med = percentile(wall, 50)
  record({ name: `${name}, ${pieces} pieces: median`, value: `${med.toFixed(0)} ms`, target: `< ${TARGET_MS} ms`, met: med < TARGET_MS, note: `p95 ${percentile(wall, 95).toFixed(0)} ms, cpu ${percentile(cpu, 50).toFixed(0)} ms` })
}

/**
 * The real shop: 20 profiles of 3 identical moulds each; every item names only its profile;
 * 8 casters (two on short days, each with an absence, one a fortnight away); a holiday on Monday
 * 18 January; two moulds still being made; 30 to 80 h of fettling and drying per cast.
 */
function shopInput(base: PlanPoursInput): PlanPoursInput {
  const moulds = base.moulds.map((m, i): PlannerMould => ({
    ...m, profileId: `p${(i % 20) + 1}`, ...(i === 5 || i === 25 ? { availableFrom: new Date('2027-01-13T00:00:00Z') } : {}),
  }))
  const casters = Array.from({ length: 8 }, (_, i) => `c${i + 1}`)
  const casterCalendars = Object.fromEntries(casters.map((c, i) => [c, {
    ...(i < 2 ? { shiftStart: '09:00', shiftEnd: '13:00' } : {}),
    absences: [i === 7
      ? { fromDay: '2027-01-11', toDay: '2027-01-22' }
      : { fromDay: `2027-01-${String(5 + 2 * i).padStart(2, '0')}`, toDay: `2027-01-${String(6 + 2 * i).padStart(2, '0')}` }],
    maxMixes: i === 0 ? 2 : 1,
  }]))
  return {
    ...base,
    moulds,
    closures: [{ fromDay: '2027-01-18', toDay: '2027-01-18' }],
    items: base.items.map((it, i) => ({ ...it, mouldIds: [], profileId: `p${(i % 20) + 1}`, readyHours: 30 + (i % 6) * 10 })),
    options: { casters, casterCalendars, benchMaxMixes: { 1: 2, 2: 2 } },
  }
}

const input = buildInput()
measure('planner', input)
measure('planner, every item on every mould', wideInput(input))
measure('planner, real shop (20 profiles, 8 casters with absences, a holiday, mould work, drying)', shopInput(input))
