// The order in which a project's files are handed to its workers. vitest runs the files it has
// no times for (all of them on a fresh clone: its times live in node_modules/.vite) largest
// first, by bytes. A few files run far longer than their size says. On a clean-clone run the
// simulated shop day (tests/api/soak.test.ts, 22 lines, 196 s under the run's load) was the
// last API file to start and the last to end, with the other worker done before it, and the
// API lane is the run's longest. The files below go first, longest first, so the two workers
// end close together: "longest processing time first" (R. L. Graham, "Bounds on
// multiprocessing timing anomalies", SIAM J. Appl. Math. 17(2), 1969) is the usual rule. The
// seconds are from clean-clone runs on 2 cores; only their order matters, and a file this list
// does not name keeps vitest's place for it.
import { relative } from 'node:path'
import { BaseSequencer, type TestSpecification } from 'vitest/node'

export const LONG_FILES: Record<string, number> = {
  'tests/e2e/axe-roles.test.ts': 208,
  'tests/api/soak.test.ts': 196,
  'tests/api/bad-input.test.ts': 151,
  'tests/api/access.test.ts': 81,
  'tests/e2e/floor.test.ts': 71,
  'tests/e2e/bench-to-wall.test.ts': 70,
  'tests/api/security-accounts.test.ts': 70,
  'tests/e2e/day.test.ts': 67,
}

export default class LongestFirst extends BaseSequencer {
  override async sort(files: TestSpecification[]) {
    const sorted = await super.sort(files)
    const seconds = (f: TestSpecification) => LONG_FILES[relative(f.project.config.root, f.moduleId).split('\\').join('/')] ?? 0
    // a stable sort: vitest's order stands among the files this list does not name
    return sorted.map((f, i) => ({ f, i })).sort((a, b) =>
      a.f.project.name === b.f.project.name ? seconds(b.f) - seconds(a.f) || a.i - b.i : a.i - b.i,
    ).map(({ f }) => f)
  }
}
