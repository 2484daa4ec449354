// A second app server on a database with no workshop (the first-run set-up), for a test file
// that needs one beside its seeded server: the file's template clone with every workshop
// truncated away, a server of its own whose console output is collected (it prints the set-up
// code there). `use()` points call(), testDb() and the browser helpers at it; `stop()` points
// them back and drops the database.
import { randomBytes } from 'node:crypto'
import { mkdtempSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { inject } from 'vitest'
import pg from 'pg'
import { cloneFileDatabase } from './file-db'
import { startAppServer, stopAppServer } from './server'
import { setTestContext, testContext, type TestContext } from './context'
import { closeTestDb } from './fixtures'

export async function startEmptyServer(env: Record<string, string> = {}) {
  const { databaseUrl, drop } = await cloneFileDatabase(inject('templateUrl'))
  const c = new pg.Client({ connectionString: databaseUrl })
  await c.connect()
  // every workshop-scoped table references workshops: CASCADE empties them all
  await c.query('TRUNCATE workshops, setup_codes CASCADE')
  await c.end()
  const output: string[] = []
  const sessionPassword = randomBytes(24).toString('hex')
  const photoDir = mkdtempSync(join(tmpdir(), 'setline-photos-'))
  const started = await startAppServer({ DATABASE_URL: databaseUrl, NUXT_SESSION_PASSWORD: sessionPassword, PHOTO_STORAGE_DIR: photoDir, ...env }, output)
  const own: TestContext = { baseUrl: started.url, databaseUrl, sessionPassword, photoDir }
  let seeded: TestContext | undefined
  return {
    url: started.url,
    databaseUrl,
    /** The set-up codes printed so far, oldest first, as printed (XXXX-XXXX-XXXX). */
    codes: () => [...output.join('').matchAll(/set-up code ([A-Z0-9]{4}-[A-Z0-9]{4}-[A-Z0-9]{4})/g)].map(m => m[1]!),
    async use() {
      seeded ??= testContext()
      await closeTestDb()
      setTestContext(own)
    },
    async stop() {
      await closeTestDb()
      if (seeded) setTestContext(seeded)
      await stopAppServer(started.proc)
      rmSync(photoDir, { recursive: true, force: true })
      await drop()
    },
  }
}
