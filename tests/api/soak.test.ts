// The soak's short version (tests/soak/sim.ts; the week is `npm run soak`): one simulated shop
// day with six caster tablets and three finishers, every fault kind on a seeded schedule (tablets
// dropping, the app instance A killed mid-request and restarted, PostgreSQL stopped and
// started, the mail relay refusing), then the invariants only, never a timing. It runs on a
// PostgreSQL and two app instances of its own (the file's own server from per-file.ts is left
// idle), since it stops the database. SOAK_SEED replays another schedule.
import { describe, expect, it } from 'vitest'
import { runSoak } from '../soak/sim'

const SEED = Number(process.env.SOAK_SEED ?? 20261203)

describe('a simulated shop day with faults', () => {
  it(`loses and doubles nothing, answers no 500 and ends with every tablet showing the database (seed ${SEED})`, async () => {
    const report = await runSoak({ seed: SEED, days: 1, casters: 6, finishers: 3, piecesPerDay: 12, maxMinutes: 8 })
    const faults = Object.entries(report.faults).filter(([, n]) => n === 0).map(([k]) => k)
    expect(faults, 'every fault kind injected').toEqual([])
    expect(report.queuedOffline, 'actions were queued offline').toBeGreaterThan(0)
    // the names and details in the message itself: a run summary shows an error's first line only
    const failed = report.invariants.filter(i => !i.held).map(i => `${i.name}: ${i.detail}`).join(' | ')
    expect(failed, `seed ${SEED}, invariants that did not hold: ${failed}`).toBe('')
  }, 570_000)
})
