// vitest setupFile for the api and e2e projects: every test file gets a database of its own,
// cloned from the run's seeded template (tests/setup/file-db.ts), and a built app server of its
// own on it, with its own SMTP fake and photo folder.
import { mkdtempSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { randomBytes } from 'node:crypto'
import { afterAll, inject } from 'vitest'
import { startAppServer } from './server'
import { setTestContext } from './context'
import { cloneFileDatabase } from './file-db'

const { databaseUrl, drop } = await cloneFileDatabase(inject('templateUrl'))
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
  await drop()
})
