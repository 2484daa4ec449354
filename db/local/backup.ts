// npm run db:backup / npm run db:restore FILE: pg_dump and pg_restore from Debian's
// PostgreSQL, in PostgreSQL's custom format; the stored photos (.data/photos) go into a tar
// beside the dump and come back with it.
import { spawnSync } from 'node:child_process'
import { existsSync, mkdirSync, mkdtempSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join, resolve } from 'node:path'
import { findPgBin } from './pg'
import { localDbSettings, root } from './config'

function pgBin(tool: 'pg_dump' | 'pg_restore') {
  const dir = findPgBin()
  const path = dir ? join(dir, tool) : tool
  return existsSync(path) ? path : tool
}

function connection(url: string) {
  const u = new URL(url)
  return {
    args: ['-h', u.hostname, '-p', u.port || '5432', '-U', decodeURIComponent(u.username), '-d', u.pathname.slice(1)],
    env: { ...process.env, PGPASSWORD: decodeURIComponent(u.password) },
  }
}

function photosDir(env = process.env) {
  return resolve(root, env.PHOTO_STORAGE_DIR ?? join(env.SETLINE_DATA_DIR ?? '.data', 'photos'))
}

function run(cmd: string, args: string[], env: NodeJS.ProcessEnv) {
  const r = spawnSync(cmd, args, { env, encoding: 'utf8' })
  if (r.status !== 0) throw new Error(`${cmd} failed: ${r.stderr || r.error?.message}`)
}

/** Writes <dir>/setline-<stamp>.dump (and .photos.tar when there are photos); returns the dump path. */
export function backup(url: string, dir = resolve(root, '.data/backups'), photos = photosDir()) {
  mkdirSync(dir, { recursive: true })
  const stamp = new Date().toISOString().replace(/[-:]/g, '').replace(/\..*$/, '')
  const file = join(dir, `setline-${stamp}.dump`)
  const c = connection(url)
  // The background queue's own schema (pg-boss, made by db:migrate) is left out: its rows are
  // work in flight that the app schedules again, and its partitioned tables cannot be dropped
  // and restored by pg_restore --clean (the partitions' inherited keys refuse it).
  run(pgBin('pg_dump'), ['-Fc', '--no-owner', '--exclude-schema=pgboss', '-f', file, ...c.args], c.env)
  if (existsSync(photos)) run('tar', ['-C', resolve(photos, '..'), '-cf', file.replace(/\.dump$/, '.photos.tar'), photos.split('/').pop()!], process.env)
  return file
}

/** Replaces the database's contents with the dump (and the photos with its tar, when present). */
export function restore(url: string, file: string, photos = photosDir()) {
  if (!existsSync(file)) throw new Error(`no such backup: ${file}`)
  const c = connection(url)
  // The btree_gist extension and the public schema belong to the cluster's superuser (who
  // created them), so the restore leaves them alone and replaces everything else, in one
  // transaction: a failed restore changes nothing.
  const toc = spawnSync(pgBin('pg_restore'), ['-l', file], { encoding: 'utf8' })
  if (toc.status !== 0) throw new Error(`pg_restore -l failed: ${toc.stderr}`)
  const list = join(mkdtempSync(join(tmpdir(), 'setline-restore-')), 'toc.list')
  writeFileSync(list, toc.stdout.split('\n').filter(l => !/ (EXTENSION|SCHEMA) /.test(l) && !/ COMMENT - EXTENSION /.test(l)).join('\n'))
  run(pgBin('pg_restore'), ['--clean', '--if-exists', '--no-owner', '--single-transaction', '-L', list, ...c.args, file], c.env)
  const tar = file.replace(/\.dump$/, '.photos.tar')
  if (existsSync(tar)) {
    mkdirSync(resolve(photos, '..'), { recursive: true })
    run('tar', ['-C', resolve(photos, '..'), '-xf', tar], process.env)
  }
}

function main() {
  const [cmd, file] = process.argv.slice(2)
  const url = process.env.DATABASE_URL ?? localDbSettings().url
  if (cmd === 'backup') {
    console.log(`backup written: ${backup(url)}`)
  }
  else if (cmd === 'restore' && file) {
    restore(url, resolve(file))
    console.log(`restored from ${file}`)
  }
  else {
    console.error('usage: npm run db:backup | npm run db:restore FILE')
    process.exit(2)
  }
}

if (process.argv[1]?.endsWith('backup.ts')) {
  try {
    main()
  }
  catch (err) {
    console.error(err instanceof Error ? err.message : err)
    process.exit(1)
  }
}
