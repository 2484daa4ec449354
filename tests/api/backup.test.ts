// npm run db:backup / db:restore: a round trip through pg_dump and pg_restore (Debian's
// PostgreSQL) on a cluster of its own, photos included.
import { mkdtempSync, chmodSync, rmSync, mkdirSync, writeFileSync, readFileSync, existsSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import knex from 'knex'
import { afterAll, describe, expect, it } from 'vitest'
import { downCluster, type DbTarget } from '../../db/local/cluster'
import { backup, restore } from '../../db/local/backup'
import { ownSeededCluster } from '../setup/throwaway-db'

const base = mkdtempSync(join(tmpdir(), 'setline-backup-'))
chmodSync(base, 0o755)
let target: DbTarget | undefined

afterAll(() => {
  if (target) downCluster(target)
  rmSync(base, { recursive: true, force: true })
})

describe('backup and restore', () => {
  it('brings back the rows and the photo files as they were at the backup', async () => {
    target = await ownSeededCluster(base, 'backup')
    const photos = join(base, 'data', 'photos')
    mkdirSync(photos, { recursive: true })
    writeFileSync(join(photos, 'a.webp'), 'photo bytes')
    const k = knex({ client: 'pg', connection: target.url })
    const jobs = async () => (await k('jobs').orderBy('code').pluck('code')) as string[]
    const before = await jobs()
    expect(before).toEqual(['J-2601', 'J-2602', 'J-2603'])

    const file = backup(target.url, join(base, 'backups'), photos)
    expect(existsSync(file.replace(/\.dump$/, '.photos.tar'))).toBe(true)

    await k('job_members').del()
    await k('jobs').where({ code: 'J-2603' }).del()
    await k('workshops').insert({ name: 'Added after the backup' })
    rmSync(join(photos, 'a.webp'))

    restore(target.url, file, photos)
    expect(await jobs()).toEqual(before)
    expect(await k('workshops').where({ name: 'Added after the backup' }).first()).toBeUndefined()
    expect(Number((await k('job_members').count('* as n').first())!.n)).toBe(3)
    expect(readFileSync(join(photos, 'a.webp'), 'utf8')).toBe('photo bytes')
    // the no-overlap constraint and the register's append-only trigger come back with the tables
    const constraint = await k.raw(`SELECT 1 FROM pg_constraint WHERE conname = 'pours_no_overlap'`)
    expect(constraint.rows).toHaveLength(1)
    await expect(k('events').del()).rejects.toThrow(/append-only/)
    await k.destroy()
  }, 120_000)

  it('refuses a file that does not exist', () => {
    expect(() => restore('postgres://x:y@127.0.0.1:1/z', join(base, 'nope.dump'))).toThrow(/no such backup/)
  })
})
