// What an API or browser test file talks to: its own app server on its own database, made by
// tests/setup/per-file.ts before the file runs. Test files read it through testContext().
export interface TestContext {
  baseUrl: string
  databaseUrl: string
  sessionPassword: string
  photoDir: string
}

let current: TestContext | undefined

export function setTestContext(ctx: TestContext | undefined) {
  current = ctx
}

export function testContext(): TestContext {
  if (!current) throw new Error('No test server: API and browser tests run through npm test (tests/setup/per-file.ts)')
  return current
}
