// vitest setupFile for the api and e2e projects: every test file gets a database of its own,
// cloned from the run's seeded template (PostgreSQL's CREATE DATABASE … TEMPLATE copies the
// files, about a tenth of a second), and a built app server of its own on it, with its own
// SMTP fake and photo folder. No file books around another's rows, and a file that fills
// its database (the 100,000-pour register) slows nobody after it.
import { mkdtempSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { randomBytes } from 'node:crypto'
import { afterAll, inject } from 'vitest'
import pg from 'pg'
import { startAppServer } from './server'
import { setTestContext } from './context'

async function admin<T>(templateUrl: string, work: (c: pg.Client) => Promise<T>) {
  const url = new URL(templateUrl)
  url.pathname = '/postgres'
  const client = new pg.Client({ connectionString: url.toString() })
  await client.connect()
  try {
    return await work(client)
  }
  finally {
    await client.end()
  }
}

const templateUrl = inject('templateUrl')
const template = new URL(templateUrl).pathname.slice(1)
const name = `setline_file_${randomBytes(6).toString('hex')}`
await admin(templateUrl, c => c.query(`CREATE DATABASE "${name}" TEMPLATE "${template}"`))
const databaseUrl = Object.assign(new URL(templateUrl), { pathname: `/${name}` }).toString()
const sessionPassword = randomBytes(24).toString('hex')
// photos go to a throwaway folder; a 2 MB limit lets the tests send an oversize file cheaply
const photoDir = mkdtempSync(join(tmpdir(), 'setline-photos-'))
const started = await startAppServer({ DATABASE_URL: databaseUrl, NUXT_SESSION_PASSWORD: sessionPassword, PHOTO_STORAGE_DIR: photoDir, PHOTO_MAX_BYTES: String(2 * 1024 * 1024) })
setTestContext({ baseUrl: started.url, databaseUrl, sessionPassword, photoDir })

afterAll(async () => {
  const { closeTestDb } = await import('./fixtures')
  await closeTestDb()
  started.proc.kill('SIGTERM')
  await new Promise<void>((resolve) => {
    const t = setTimeout(() => {
      started.proc.kill('SIGKILL')
      resolve()
    }, 3000)
    started.proc.once('exit', () => {
      clearTimeout(t)
      resolve()
    })
  })
  setTestContext(undefined)
  rmSync(photoDir, { recursive: true, force: true })
  await admin(templateUrl, c => c.query(`DROP DATABASE IF EXISTS "${name}" WITH (FORCE)`))
})
