/**
 * Runs every benchmark script in tests/bench (each a plain tsx script that prints its figures),
 * one after another so they do not compete for the machine's cores. Exits non-zero only when a
 * script crashes; timings are printed, never asserted.
 */
import { spawnSync } from 'node:child_process'
import { readdirSync } from 'node:fs'
import { fileURLToPath } from 'node:url'
import { dirname, join } from 'node:path'

const here = dirname(fileURLToPath(import.meta.url))
const scripts = readdirSync(here).filter(f => f.endsWith('.ts') && f !== 'run.ts').sort()
let failed = 0
for (const script of scripts) {
  console.log(`\n== ${script}`)
  const run = spawnSync(process.execPath, ['--import', 'tsx', join(here, script)], { stdio: 'inherit' })
  if (run.status !== 0) {
    failed++
    console.error(`${script} exited with ${run.status ?? run.signal}`)
  }
}
process.exitCode = failed ? 1 : 0
