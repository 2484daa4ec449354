// Where photo files live: an unstorage mount on the filesystem (.data/photos by default) or,
// when S3_ENDPOINT and S3_BUCKET are set, an S3-compatible bucket (unstorage's s3 driver,
// signed with aws4fetch). Keys are random UUIDs, so a key cannot be guessed from a job id.
import { randomUUID } from 'node:crypto'
import { resolve } from 'node:path'
import { createStorage, type Storage } from 'unstorage'
import fsDriver from 'unstorage/drivers/fs'
import s3Driver from 'unstorage/drivers/s3'
import { appEnv } from './env'

export interface PhotoStorageOptions {
  dir: string
  s3?: { endpoint: string; bucket: string; accessKeyId: string; secretAccessKey: string; region: string }
}

export function createPhotoStorage(opts: PhotoStorageOptions): Storage {
  const driver = opts.s3 ? s3Driver(opts.s3) : fsDriver({ base: resolve(opts.dir) })
  return createStorage({ driver })
}

/** The storage options the app's environment asks for. */
export function photoStorageOptions(): PhotoStorageOptions {
  const e = appEnv()
  const s3 = e.S3_ENDPOINT && e.S3_BUCKET
    ? { endpoint: e.S3_ENDPOINT, bucket: e.S3_BUCKET, accessKeyId: e.S3_ACCESS_KEY_ID ?? '', secretAccessKey: e.S3_SECRET_ACCESS_KEY ?? '', region: e.S3_REGION }
    : undefined
  return { dir: e.PHOTO_STORAGE_DIR, s3 }
}

let storage: Storage | undefined
export function photoStorage(): Storage {
  storage ??= createPhotoStorage(photoStorageOptions())
  return storage
}

/** A fresh, unguessable key for one stored file. */
export function newPhotoKey() {
  return `${randomUUID()}.webp`
}

/** Reads a stored file as a Buffer (the fs driver gives a Buffer, the s3 driver an ArrayBuffer). */
export async function readPhotoFile(s: Storage, key: string): Promise<Buffer | null> {
  const raw = await s.getItemRaw<Buffer | ArrayBuffer | Uint8Array>(key)
  if (!raw) return null
  return Buffer.isBuffer(raw) ? raw : Buffer.from(raw instanceof ArrayBuffer ? raw : raw.buffer)
}
