// Figures the benchmark scripts report to run.ts, which prints them as one table at the end of
// `npm run bench` and writes them to test-output/bench.json and bench.md. A script run alone
// (without run.ts) only prints.
import { appendFileSync } from 'node:fs'

export interface Figure {
  /** what was measured, as the README table names it */
  name: string
  /** the figure as printed, e.g. "23 ms" */
  value: string
  /** the goal from the issue, e.g. "< 50 ms"; empty when there is none */
  target?: string
  /** whether the figure meets the target; undefined when there is none */
  met?: boolean
  /** the side-by-side reference or a short note */
  note?: string
}

/** Sends a figure to run.ts (through the file it names in BENCH_RESULTS). */
export function record(f: Figure) {
  const file = process.env.BENCH_RESULTS
  if (file) appendFileSync(file, JSON.stringify(f) + '\n')
}
