// The local PostgreSQL cluster: Debian's server binaries, a data folder owned by an
// unprivileged OS user (initdb refuses root), listening only on 127.0.0.1.
import { spawnSync, type SpawnSyncOptions } from 'node:child_process'
import { existsSync, mkdirSync, readdirSync, chownSync, chmodSync } from 'node:fs'
import { createHash } from 'node:crypto'
import { join, resolve, dirname } from 'node:path'

export interface Cluster {
  dataDir: string
  port: number
  bin: string
  /** OS user that owns the cluster; null when we are not root and run as ourselves. */
  osUser: string | null
}

const isRoot = () => process.getuid?.() === 0

function run(cmd: string, args: string[], opts: SpawnSyncOptions & { asUser?: string | null } = {}) {
  const { asUser, ...rest } = opts
  const [file, argv] = asUser ? ['runuser', ['-u', asUser, '--', cmd, ...args]] : [cmd, args]
  return spawnSync(file, argv, { encoding: 'utf8', ...rest })
}

/** Newest Debian PostgreSQL server bin folder, or null when the server is not installed. */
export function findPgBin(): string | null {
  const root = '/usr/lib/postgresql'
  if (!existsSync(root)) return null
  const versions = readdirSync(root)
    .filter(v => existsSync(join(root, v, 'bin', 'initdb')) && existsSync(join(root, v, 'bin', 'pg_ctl')))
    .sort((a, b) => Number(a) - Number(b))
  const v = versions.at(-1)
  return v ? join(root, v, 'bin') : null
}

/** Finds the server binaries, installing Debian's postgresql with apt-get when we are root. */
export function ensurePostgresInstalled(): string {
  const found = findPgBin()
  if (found) return found
  const command = 'apt-get update && apt-get install -y postgresql postgresql-contrib'
  if (!isRoot()) {
    console.error(`setline: PostgreSQL server binaries are missing. Install them, then run again:\n  sudo sh -c '${command}'`)
    process.exit(1)
  }
  console.log('setline: installing PostgreSQL from Debian (apt-get)…')
  const env = { ...process.env, DEBIAN_FRONTEND: 'noninteractive' }
  for (const args of [['update', '-qq'], ['install', '-y', '-qq', 'postgresql', 'postgresql-contrib']]) {
    const r = spawnSync('apt-get', args, { stdio: 'inherit', env })
    if (r.status !== 0) {
      console.error(`setline: apt-get ${args.join(' ')} failed; run it by hand:\n  ${command}`)
      process.exit(1)
    }
  }
  const bin = findPgBin()
  if (!bin) throw new Error('PostgreSQL was installed but no server binaries were found under /usr/lib/postgresql')
  return bin
}

/** The unprivileged owner of the cluster: the postgres user Debian's package creates. */
export function clusterOwner(): string | null {
  if (!isRoot()) return null
  const r = spawnSync('id', ['-u', 'postgres'])
  if (r.status !== 0) {
    spawnSync('useradd', ['--system', '--home-dir', '/var/lib/postgresql', '--shell', '/bin/sh', 'postgres'], { stdio: 'inherit' })
  }
  return 'postgres'
}

/**
 * The data folder: `preferred` when the owner can reach it, otherwise a per-checkout
 * folder under /var/tmp (a checkout under a mode-700 home cannot be traversed by
 * the postgres user).
 */
export function resolveDataDir(preferred: string, osUser: string | null): string {
  const parent = dirname(resolve(preferred))
  mkdirSync(parent, { recursive: true })
  if (!osUser) return resolve(preferred)
  // `test -x` as that user resolves the whole path, so it fails if any parent is closed
  if (run('test', ['-x', parent], { asUser: osUser }).status === 0) return resolve(preferred)
  const tag = createHash('sha256').update(resolve(preferred)).digest('hex').slice(0, 12)
  const fallback = `/var/tmp/setline-${tag}/postgres`
  console.log(`setline: ${parent} is not reachable by the ${osUser} user; the database lives in ${fallback}`)
  return fallback
}

function prepareDir(dataDir: string, osUser: string | null) {
  mkdirSync(dataDir, { recursive: true })
  if (osUser) {
    const uid = Number(String(spawnSync('id', ['-u', osUser], { encoding: 'utf8' }).stdout).trim())
    const gid = Number(String(spawnSync('id', ['-g', osUser], { encoding: 'utf8' }).stdout).trim())
    chownSync(dataDir, uid, gid)
  }
  chmodSync(dataDir, 0o700)
}

/** Creates the cluster when its data folder is empty. Returns true when it was created. */
export function initCluster(c: Cluster): boolean {
  if (existsSync(join(c.dataDir, 'PG_VERSION'))) return false
  prepareDir(c.dataDir, c.osUser)
  const r = run(join(c.bin, 'initdb'), [
    '-D', c.dataDir, '-U', 'postgres', '--auth-local=trust', '--auth-host=scram-sha-256',
    '-E', 'UTF8', '--locale=C.UTF-8', '--no-instructions',
  ], { asUser: c.osUser, cwd: '/' })
  if (r.status !== 0) throw new Error(`initdb failed:\n${r.stdout}\n${r.stderr}`)
  return true
}

export function isRunning(c: Cluster): boolean {
  return run(join(c.bin, 'pg_ctl'), ['-D', c.dataDir, 'status'], { asUser: c.osUser, cwd: '/' }).status === 0
}

/** Starts the server (no-op when it already runs). Returns true when it was started now. */
export function startCluster(c: Cluster): boolean {
  if (isRunning(c)) return false
  const log = join(c.dataDir, 'server.log')
  const opts = `-c listen_addresses=127.0.0.1 -p ${c.port} -k ${c.dataDir} -c unix_socket_permissions=0700`
  const r = run(join(c.bin, 'pg_ctl'), ['-D', c.dataDir, '-l', log, '-o', opts, '-w', '-t', '60', 'start'], { asUser: c.osUser, cwd: '/' })
  if (r.status !== 0) {
    const tail = run('tail', ['-n', '20', log]).stdout
    throw new Error(`PostgreSQL did not start on 127.0.0.1:${c.port} (is the port taken? set PGPORT):\n${r.stderr}\n${tail}`)
  }
  return true
}

export function stopCluster(c: Cluster): boolean {
  if (!existsSync(join(c.dataDir, 'PG_VERSION')) || !isRunning(c)) return false
  run(join(c.bin, 'pg_ctl'), ['-D', c.dataDir, '-m', 'fast', '-w', 'stop'], { asUser: c.osUser, cwd: '/' })
  return true
}

/** Runs SQL as the superuser over the cluster's own socket (trust on the socket only). */
export function psql(c: Cluster, sql: string, db = 'postgres'): string {
  const r = run(join(c.bin, 'psql'), ['-h', c.dataDir, '-p', String(c.port), '-U', 'postgres', '-d', db, '-v', 'ON_ERROR_STOP=1', '-qAt', '-c', sql], { asUser: c.osUser, cwd: '/' })
  if (r.status !== 0) throw new Error(`psql failed: ${r.stderr}`)
  return String(r.stdout).trim()
}

/** Creates the application role and database when missing (idempotent). */
export function ensureDatabase(c: Cluster, db: { user: string; password: string; name: string }) {
  const quoted = db.password.replace(/'/g, '\'\'')
  const hasRole = psql(c, `SELECT 1 FROM pg_roles WHERE rolname = '${db.user}'`) === '1'
  psql(c, hasRole
    ? `ALTER ROLE "${db.user}" WITH LOGIN PASSWORD '${quoted}'`
    : `CREATE ROLE "${db.user}" LOGIN PASSWORD '${quoted}'`)
  const hasDb = psql(c, `SELECT 1 FROM pg_database WHERE datname = '${db.name}'`) === '1'
  if (!hasDb) psql(c, `CREATE DATABASE "${db.name}" OWNER "${db.user}"`)
  // btree_gist backs the no-overlap exclusion constraint on pours; created by the superuser.
  psql(c, 'CREATE EXTENSION IF NOT EXISTS btree_gist', db.name)
}
