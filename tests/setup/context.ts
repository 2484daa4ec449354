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

let databaseOnly: string | undefined

/** The services project's file: a database of its own and no server (tests/setup/services.ts). */
export function setTestDatabase(url: string | undefined) {
  databaseOnly = url
}

/** The test file's own database, with or without a server on it. */
export function testDatabaseUrl(): string {
  const url = current?.databaseUrl ?? databaseOnly
  if (!url) throw new Error('No test database: tests run through npm test (tests/setup/per-file.ts or services.ts)')
  return url
}

export function testContext(): TestContext {
  if (!current) throw new Error('No test server: API and browser tests run through npm test (tests/setup/per-file.ts)')
  return current
}
