// vitest setupFile for the services project: the file's own database cloned from the run's
// template (tests/setup/file-db.ts) and no server. Tests import server/repos and
// server/services directly; their Nitro auto-imports are added by the project's unimport
// plugin (tests/setup/server-imports.ts), and useDb() connects to DATABASE_URL, set here
// before any server code reads the settings.
import { afterAll, inject } from 'vitest'
import { cloneFileDatabase } from './file-db'
import { setTestDatabase } from './context'
import { closeDb } from '../../server/utils/db'
// the templateUrl that inject() reads is declared beside the globalSetup that provides it
import type {} from './server'

const { databaseUrl, drop } = await cloneFileDatabase(inject('templateUrl'))
process.env.DATABASE_URL = databaseUrl
setTestDatabase(databaseUrl)

afterAll(async () => {
  const { closeTestDb } = await import('./fixtures')
  await closeTestDb()
  await closeDb()
  setTestDatabase(undefined)
  await drop()
})
