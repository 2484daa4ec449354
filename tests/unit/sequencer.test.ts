// The test run's file order (tests/setup/sequencer.ts): the files that run long for their size
// go first, longest first; every other file keeps vitest's order (largest first on a fresh clone).
import { existsSync, statSync } from 'node:fs'
import { join } from 'node:path'
import { describe, expect, it } from 'vitest'
import type { TestSpecification } from 'vitest/node'
import LongestFirst, { LONG_FILES } from '../setup/sequencer'

const root = join(import.meta.dirname, '../..')
const spec = (project: string, file: string) => ({
  moduleId: join(root, file),
  project: { name: project, config: { root, isolate: false, sequence: { groupOrder: 0 } } },
}) as unknown as TestSpecification
// vitest's cache as on a fresh clone: no results, only each file's size
const ctx = { config: { root }, cache: { getFileTestResults: () => undefined, getFileStats: (key: string) => ({ size: statSync(join(root, key.split(':')[1]!)).size }) } }
const order = async (files: TestSpecification[]) => (await new LongestFirst(ctx as never).sort(files)).map(f => `${f.project.name}:${f.moduleId.slice(root.length + 1)}`)

describe('the order of the test files', () => {
  it('names only files that exist', () => {
    expect(Object.keys(LONG_FILES).filter(f => !existsSync(join(root, f)))).toEqual([])
  })

  it('hands out the long files first, longest first, then the rest by size as vitest would', async () => {
    const files = ['tests/api/auth.test.ts', 'tests/api/soak.test.ts', 'tests/api/access.test.ts', 'tests/api/bad-input.test.ts', 'tests/api/words.test.ts']
    const bySize = files.filter(f => !LONG_FILES[f]).sort((a, b) => statSync(join(root, b)).size - statSync(join(root, a)).size)
    expect(await order(files.map(f => spec('api', f)))).toEqual(['tests/api/soak.test.ts', 'tests/api/bad-input.test.ts', 'tests/api/access.test.ts', ...bySize].map(f => `api:${f}`))
  })

  it('keeps each project\'s files together', async () => {
    const got = await order([spec('e2e', 'tests/e2e/sign-in.test.ts'), spec('api', 'tests/api/words.test.ts'), spec('e2e', 'tests/e2e/axe-roles.test.ts'), spec('api', 'tests/api/soak.test.ts')])
    expect(got).toEqual(['api:tests/api/soak.test.ts', 'api:tests/api/words.test.ts', 'e2e:tests/e2e/axe-roles.test.ts', 'e2e:tests/e2e/sign-in.test.ts'])
  })
})
