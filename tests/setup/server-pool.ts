// App servers started ahead for the api and e2e projects (their globalSetup, tests/setup/server.ts).
// Every API and browser file still gets a server and a database of its own, cloned from the
// run's seeded template; but a server takes seconds to start (load the build, connect, start
// the queue and the SMTP fake), and a file used to wait for its own. Here the main vitest
// process keeps as many servers ready as the project has workers, each already on a fresh
// database: a file claims one over a local HTTP call (tests/setup/per-file.ts) and the next is
// started while it runs; a released server is stopped and its database dropped behind it.
import { createServer, type Server } from 'node:http'
import { mkdtempSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { randomBytes } from 'node:crypto'
import type { ChildProcess } from 'node:child_process'
import { cloneFileDatabase } from './file-db'
import { startAppServer, stopAppServer } from './server'
import type { TestContext } from './context'

export interface PooledServer extends TestContext { id: string }

interface Running { ctx: PooledServer; proc: ChildProcess; drop: () => Promise<unknown> }

let serial = 0

async function startOne(templateUrl: string): Promise<Running> {
  const { databaseUrl, drop } = await cloneFileDatabase(templateUrl)
  const sessionPassword = randomBytes(24).toString('hex')
  // photos go to a throwaway folder; a 2 MB limit lets the tests send an oversize file cheaply
  const photoDir = mkdtempSync(join(tmpdir(), 'setline-photos-'))
  try {
    // a start ahead competes with the file running beside it, and nobody waits on it yet: it gets
    // three times the minute a file's own start had
    const started = await startAppServer({ DATABASE_URL: databaseUrl, NUXT_SESSION_PASSWORD: sessionPassword, PHOTO_STORAGE_DIR: photoDir, PHOTO_MAX_BYTES: String(2 * 1024 * 1024) }, undefined, true, 180_000)
    return { ctx: { id: String(++serial), baseUrl: started.url, databaseUrl, sessionPassword, photoDir }, proc: started.proc, drop }
  }
  catch (err) {
    rmSync(photoDir, { recursive: true, force: true })
    await drop()
    throw err
  }
}

async function stopOne(r: Running) {
  await stopAppServer(r.proc)
  rmSync(r.ctx.photoDir, { recursive: true, force: true })
  await r.drop()
}

/**
 * `ahead` servers are kept ready while files remain (`files`: how many will claim one); a claim
 * takes the oldest, or starts one when none is ready. Returns the broker's address and its stop.
 */
export async function startServerPool(templateUrl: string, ahead: number, files: number) {
  const ready: Promise<Running>[] = []
  const claimed = new Map<string, Running>()
  const stopping = new Set<Promise<void>>()
  let started = 0
  const startAhead = () => {
    while (ready.length < ahead && started < files) {
      started++
      const p = startOne(templateUrl)
      // a failed start is reported to the file that claims it, not as an unhandled rejection here
      p.catch(() => {})
      ready.push(p)
    }
  }
  const claim = async () => {
    if (!ready.length) started++
    const next = ready.shift() ?? startOne(templateUrl)
    startAhead()
    const r = await next
    claimed.set(r.ctx.id, r)
    return r.ctx
  }
  const release = (id: string) => {
    const r = claimed.get(id)
    if (!r) return
    claimed.delete(id)
    const p = stopOne(r).finally(() => stopping.delete(p))
    stopping.add(p)
  }
  const broker: Server = createServer((req, res) => {
    const answer = (status: number, body: unknown) => {
      res.writeHead(status, { 'content-type': 'application/json' })
      res.end(JSON.stringify(body))
    }
    const url = new URL(req.url ?? '/', 'http://pool')
    if (req.method === 'POST' && url.pathname === '/claim') {
      claim().then(ctx => answer(200, ctx), (err: Error) => answer(500, { message: err.message }))
    }
    else if (req.method === 'POST' && url.pathname === '/release') {
      release(url.searchParams.get('id') ?? '')
      answer(200, {})
    }
    else {
      answer(404, {})
    }
  })
  await new Promise<void>(resolve => broker.listen(0, '127.0.0.1', resolve))
  const address = broker.address()
  const port = typeof address === 'object' && address ? address.port : 0
  startAhead()
  return {
    url: `http://127.0.0.1:${port}`,
    async stop() {
      broker.close()
      for (const id of [...claimed.keys()]) release(id)
      const unclaimed = await Promise.allSettled(ready.splice(0))
      for (const r of unclaimed) if (r.status === 'fulfilled') stopping.add(stopOne(r.value))
      await Promise.allSettled([...stopping])
    },
  }
}

/** The file's server, claimed from the pool whose address the globalSetup provided. */
export async function claimServer(poolUrl: string): Promise<PooledServer> {
  const res = await fetch(`${poolUrl}/claim`, { method: 'POST' })
  const body = await res.json() as PooledServer & { message?: string }
  if (!res.ok) throw new Error(`no test server: ${body.message}`)
  return body
}

/** Hands the server back: the pool stops it and drops its database after the file. */
export async function releaseServer(poolUrl: string, id: string) {
  await fetch(`${poolUrl}/release?id=${encodeURIComponent(id)}`, { method: 'POST' })
}
