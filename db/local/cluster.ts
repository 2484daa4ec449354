// One place that brings the local cluster up for npm start, db:* and npm test.
import knex, { type Knex } from 'knex'
import { readdirSync } from 'node:fs'
import { join, resolve } from 'node:path'
import { pathToFileURL } from 'node:url'
import {
  ensurePostgresInstalled, clusterOwner, resolveDataDir, initCluster, startCluster,
  stopCluster, ensureDatabase, type Cluster,
} from './pg'
import { root } from './config'
import { installJobQueue, jobQueueReady } from './job-queue'

const migrationsDir = resolve(root, 'db/migrations')

export interface DbTarget { port: number; user: string; password: string; name: string; dataDir: string; url: string }

export function clusterFor(db: DbTarget): Cluster {
  const bin = ensurePostgresInstalled()
  const osUser = clusterOwner()
  return { bin, osUser, port: db.port, dataDir: resolveDataDir(db.dataDir, osUser) }
}

/** Creates (once) and starts (idempotent) the cluster, then the role and database. */
export function upCluster(db: DbTarget) {
  const cluster = clusterFor(db)
  const created = initCluster(cluster)
  const started = startCluster(cluster)
  ensureDatabase(cluster, db)
  return { cluster, created, started }
}

export function downCluster(db: DbTarget) {
  return stopCluster(clusterFor(db))
}

/**
 * Lists db/migrations and imports each file itself, so TypeScript migrations load wherever
 * this module runs (tsx for npm start, vitest's transform in tests).
 */
const migrationSource: Knex.MigrationSource<string> = {
  async getMigrations() {
    return readdirSync(migrationsDir).filter(f => f.endsWith('.ts')).sort()
  },
  getMigrationName: name => name,
  getMigration: name => import(pathToFileURL(join(migrationsDir, name)).href),
}

export async function migrate(url: string) {
  const k = knex({ client: 'pg', connection: url, pool: { min: 0, max: 2 } })
  try {
    const [, done] = await k.migrate.latest({ migrationSource, tableName: 'knex_migrations' })
    // the job queue's tables too, so the app never needs to create any (db/local/job-queue.ts)
    await installJobQueue(url)
    return done as string[]
  }
  finally {
    await k.destroy()
  }
}

/**
 * Migrations not applied yet (names), for a production start that refuses to run on an old
 * schema; the job queue's schema counts as one when pg-boss's own check fails.
 */
export async function pendingMigrations(url: string): Promise<string[]> {
  const k = knex({ client: 'pg', connection: url, pool: { min: 0, max: 1 } })
  try {
    const [, pending] = await k.migrate.list({ migrationSource, tableName: 'knex_migrations' }) as [unknown, unknown[]]
    const names = pending.map(m => typeof m === 'string' ? m : String((m as { file?: string; name?: string }).file ?? (m as { name?: string }).name))
    return (await jobQueueReady(url)) ? names : [...names, 'the job queue schema (pg-boss)']
  }
  finally {
    await k.destroy()
  }
}

/** Seeds the invented demo workshop when the database has no workshop yet. */
export async function seedIfEmpty(url: string) {
  const k = knex({ client: 'pg', connection: url, pool: { min: 0, max: 2 } })
  try {
    const row = await k('workshops').count<{ count: string }[]>('* as count').first()
    if (Number(row?.count ?? 0) > 0) return false
    const { seedDemo } = await import('../seeds/demo')
    await seedDemo(k)
    return true
  }
  finally {
    await k.destroy()
  }
}
