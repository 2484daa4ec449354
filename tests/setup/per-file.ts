// vitest setupFile for the api and e2e projects: every test file gets a database of its own,
// cloned from the run's seeded template, and a built app server of its own on it, with its own
// SMTP fake and photo folder. The server was started ahead by the project's pool
// (tests/setup/server-pool.ts) while the files before this one ran; the pool stops it and drops
// its database when the file hands it back.
import { afterAll, inject } from 'vitest'
import { setTestContext } from './context'
import { claimServer, releaseServer } from './server-pool'
// the serverPoolUrl that inject() reads is declared beside the globalSetup that provides it
import type {} from './server'

const poolUrl = inject('serverPoolUrl')
const { id, ...ctx } = await claimServer(poolUrl)
setTestContext(ctx)

afterAll(async () => {
  const { closeTestDb } = await import('./fixtures')
  await closeTestDb()
  setTestContext(undefined)
  await releaseServer(poolUrl, id)
})
