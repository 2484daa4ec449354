// The photo storage mount with both drivers: the filesystem, and S3 through s3rver (a local
// S3-compatible fake) on a free port against a temporary folder.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { mkdtempSync, readdirSync, rmSync } from 'node:fs'
import { createServer } from 'node:net'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import S3rver from 's3rver'
import { createPhotoStorage, newPhotoKey, readPhotoFile } from '../../server/utils/storage'

const dirs: string[] = []
const tempDir = (label: string) => {
  const d = mkdtempSync(join(tmpdir(), `setline-${label}-`))
  dirs.push(d)
  return d
}
function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const srv = createServer().listen(0, '127.0.0.1', () => {
      const port = (srv.address() as { port: number }).port
      srv.close(() => resolve(port))
    }).on('error', reject)
  })
}

let s3: S3rver | undefined
let endpoint = ''
beforeAll(async () => {
  const port = await freePort()
  s3 = new S3rver({ port, address: '127.0.0.1', directory: tempDir('s3rver'), silent: true, configureBuckets: [{ name: 'photos', configs: [] }] })
  await s3.run()
  endpoint = `http://127.0.0.1:${port}`
})
afterAll(async () => {
  await s3?.close()
  for (const d of dirs) rmSync(d, { recursive: true, force: true })
})

describe('photo storage', () => {
  it('keys are random and look nothing like ids', () => {
    const a = newPhotoKey()
    expect(a).toMatch(/^[0-9a-f-]{36}\.webp$/)
    expect(newPhotoKey()).not.toBe(a)
  })

  it('the filesystem driver writes under the configured folder and removes the file', async () => {
    const dir = tempDir('photos')
    const store = createPhotoStorage({ dir })
    const key = newPhotoKey()
    const bytes = Buffer.from([0x52, 0x49, 0x46, 0x46, 1, 2, 3])
    await store.setItemRaw(key, bytes)
    expect(readdirSync(dir)).toEqual([key])
    expect(await readPhotoFile(store, key)).toEqual(bytes)
    await store.removeItem(key)
    expect(readdirSync(dir)).toEqual([])
    expect(await readPhotoFile(store, key)).toBeNull()
  })

  it('the s3 driver stores, reads back and deletes through an S3-compatible server', async () => {
    const store = createPhotoStorage({ dir: 'unused', s3: { endpoint, bucket: 'photos', accessKeyId: 'S3RVER', secretAccessKey: 'S3RVER', region: 'us-east-1' } })
    const key = newPhotoKey()
    const bytes = Buffer.from(Array.from({ length: 2048 }, (_, i) => i % 251))
    await store.setItemRaw(key, bytes)
    expect(await store.hasItem(key)).toBe(true)
    expect(await readPhotoFile(store, key)).toEqual(bytes)
    await store.removeItem(key)
    expect(await readPhotoFile(store, key)).toBeNull()
  })
})
