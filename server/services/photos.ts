// Photos of a job: upload (validate, make WebP variants, store, then one transaction for the
// rows), list, caption and share, delete, and serving a variant to whoever may see it.
// Clients see only shared photos of jobs they are a member of; anything else is a 404.
import type { ClientPhotoDto, PhotoDto } from '#shared/types/photos'
import { readFile } from 'node:fs/promises'
import type { Knex } from 'knex'
import type { Storage } from 'unstorage'
import type { Actor } from '../utils/auth'
import { jobsRepo } from '../repos/jobs'
import { notifyPhotosShared } from './notify'
import { answeredAction, runOnce } from './actions'
import { photosRepo, type PhotoRow, type StoredPhotoRow } from '../repos/photos'
import { PhotoRejected, processPhoto, type PhotoVariants } from '../utils/photo-image'
import { newPhotoKey, photoStorage, readPhotoFile } from '../utils/storage'
import type { PhotoUploadFields, PhotoPatch } from '#shared/utils/photo-schemas'
import type { UploadedFile } from '../utils/photo-upload'

async function jobVisibleTo(db: Knex, actor: Actor, jobId: number) {
  const job = await jobsRepo.byId(db, actor.workshopId, jobId)
  if (!job || (actor.role === 'client' && !(await jobsRepo.isMember(db, actor.workshopId, jobId, actor.id)))) notFound('Job')
}

/** A photo the actor may see: staff of its workshop, or a client member of its job when shared. */
async function visiblePhoto(db: Knex, actor: Actor, id: string): Promise<StoredPhotoRow> {
  const photo = await photosRepo.byId(db, actor.workshopId, id)
  if (!photo) notFound('Photo')
  if (actor.role === 'client' && (!photo.shared || !(await jobsRepo.isMember(db, actor.workshopId, photo.job_id, actor.id)))) notFound('Photo')
  return photo
}

/** Live event to the job room when clients may see the photo (or just saw it), else to staff only. */
function emitPhoto(actor: Actor, type: 'photo.created' | 'photo.updated' | 'photo.deleted', row: Pick<PhotoRow, 'id' | 'job_id' | 'shared'> & Partial<PhotoRow>, clientsCare: boolean) {
  // the same event reaches clients: only what a client may see (pages refetch for the rest)
  const event = { type, id: row.id, row: { id: row.id, jobId: row.job_id, shared: row.shared, caption: row.caption ?? null } }
  if (clientsCare) emitToJob(actor.workshopId, row.job_id, event)
  else emitToWorkshop(actor.workshopId, event)
}

async function checkLinks(db: Knex, actor: Actor, jobId: number, f: PhotoUploadFields) {
  let pourId = f.pourId
  if (f.pieceId) {
    const piece = await photosRepo.pieceInJob(db, actor.workshopId, jobId, f.pieceId)
    if (!piece) unprocessable([{ field: 'pieceId', message: 'is not a piece of this job' }])
    if (pourId && pourId !== piece.pour_id) unprocessable([{ field: 'pourId', message: 'is not the pour of that piece' }])
    pourId = piece.pour_id
  }
  else if (pourId && !(await photosRepo.pourInJob(db, actor.workshopId, jobId, pourId))) {
    unprocessable([{ field: 'pourId', message: 'is not a pour of this job' }])
  }
  return { pieceId: f.pieceId, pourId }
}

async function processAll(files: UploadedFile[]): Promise<(PhotoVariants & { bytes: number })[]> {
  const { PHOTO_MAX_BYTES: maxBytes, PHOTO_MAX_PIXELS: maxPixels } = appEnv()
  const out: (PhotoVariants & { bytes: number })[] = []
  // one at a time, read from its temp file only now: each decode holds a full-size bitmap in memory
  for (const f of files) {
    try {
      out.push({ ...(await processPhoto(await readFile(f.path), { maxBytes, maxPixels })), bytes: f.bytes })
    }
    catch (err) {
      if (err instanceof PhotoRejected) throw createError({ statusCode: err.statusCode, message: `${f.name}: ${err.message}`, data: { file: f.name } })
      throw err
    }
  }
  return out
}

async function removeKeys(store: Storage, keys: string[]) {
  await Promise.allSettled(keys.map(k => store.removeItem(k)))
}

/** What an upload's action id is bound to: uploading photos to this job. */
const uploadTarget = (jobId: number) => ({ kind: 'photo.upload', entityId: jobId })

/**
 * Stores the uploaded photos of a job. An upload with an `actionId` (a tablet's outbox sends
 * one, and may send it again after a lost answer) is stored once: a replay gets the first
 * answer's photos back, decoded and stored nothing; two copies at once meet in `runOnce`, and
 * the loser's stored files are removed.
 */
export async function uploadPhotos(actor: Actor, jobId: number, fields: PhotoUploadFields, files: UploadedFile[], store: Storage = photoStorage()): Promise<PhotoDto[]> {
  const db = useDb()
  await jobVisibleTo(db, actor, jobId)
  if (fields.actionId) {
    const earlier = await answeredAction<PhotoDto[]>(actor, fields.actionId, uploadTarget(jobId))
    if (earlier) return earlier.result
  }
  const links = await checkLinks(db, actor, jobId, fields)
  const processed = await processAll(files)
  const keys: string[] = []
  try {
    const stored: (PhotoVariants & { bytes: number; thumbKey: string; displayKey: string })[] = []
    for (const p of processed) {
      const thumbKey = newPhotoKey()
      const displayKey = newPhotoKey()
      keys.push(thumbKey, displayKey)
      await store.setItemRaw(thumbKey, p.thumb)
      await store.setItemRaw(displayKey, p.display)
      stored.push({ ...p, thumbKey, displayKey })
    }
    const insertRows = async (trx: Knex.Transaction) => {
      const inserted = await Promise.all(stored.map(s => photosRepo.insert(trx, actor.workshopId, {
        jobId, ...links, caption: fields.caption, shared: fields.shared, uploadedBy: actor.id,
        thumbKey: s.thumbKey, displayKey: s.displayKey, width: s.width, height: s.height, bytes: s.bytes,
      })))
      if (inserted.some(r => r.shared)) await notifyPhotosShared(trx, actor.workshopId, jobId)
      return inserted
    }
    const emitAll = (rows: PhotoRow[]) => {
      for (const row of rows) emitPhoto(actor, 'photo.created', row, row.shared)
    }
    if (!fields.actionId) {
      const rows = await db.transaction(insertRows)
      emitAll(rows)
      return rows.map(toPhotoDto)
    }
    const answer = await runOnce<PhotoDto[]>(actor, fields.actionId, uploadTarget(jobId), async (trx) => {
      const rows = await insertRows(trx)
      return { result: rows.map(toPhotoDto), after: () => emitAll(rows) }
    })
    // another copy of this upload landed first: its photos are the answer, these files are spare
    if (answer.replayed) await removeKeys(store, keys)
    return answer.result
  }
  catch (err) {
    await removeKeys(store, keys)
    rethrowDbError(err)
  }
}

export function toPhotoDto(r: PhotoRow): PhotoDto {
  return {
    id: r.id, jobId: r.job_id, pieceId: r.piece_id, pourId: r.pour_id, caption: r.caption, shared: r.shared,
    uploadedBy: r.uploaded_by, width: r.width, height: r.height, bytes: r.bytes, createdAt: r.created_at.toISOString(),
  }
}

/** Clients never learn who in the shop took a photo, nor which pour or piece it shows. */
export const toClientPhotoDto = (r: PhotoRow): ClientPhotoDto =>
  ({ id: r.id, caption: r.caption, width: r.width, height: r.height, createdAt: r.created_at.toISOString() })

/** A job's photos for staff: every one, newest first. */
export async function listPhotos(actor: Actor, jobId: number): Promise<PhotoDto[]> {
  const db = useDb()
  await jobVisibleTo(db, actor, jobId)
  return (await photosRepo.forJob(db, actor.workshopId, jobId, false)).map(toPhotoDto)
}

/** A client member's view of their job's photos: the shared ones, in the client's shape. */
export async function listClientPhotos(actor: Actor, jobId: number): Promise<ClientPhotoDto[]> {
  const db = useDb()
  await jobVisibleTo(db, actor, jobId)
  return (await photosRepo.forJob(db, actor.workshopId, jobId, true)).map(toClientPhotoDto)
}

export async function updatePhoto(actor: Actor, id: string, input: PhotoPatch): Promise<PhotoDto> {
  const db = useDb()
  const before = await visiblePhoto(db, actor, id)
  const row = await db.transaction(async (trx) => {
    const updated = await photosRepo.update(trx, actor.workshopId, id, input)
    if (!updated) notFound('Photo')
    // newly shared: the job's clients hear about it (batched to one mail per job and day)
    if (updated.shared && !before.shared) await notifyPhotosShared(trx, actor.workshopId, updated.job_id)
    return updated
  })
  emitPhoto(actor, 'photo.updated', row, row.shared || before.shared)
  return toPhotoDto(row)
}

export async function deletePhoto(actor: Actor, id: string, store: Storage = photoStorage()) {
  const db = useDb()
  const photo = await visiblePhoto(db, actor, id)
  if (actor.role !== 'lead' && photo.uploaded_by !== actor.id) {
    throw createError({ statusCode: 403, message: 'Only the person who uploaded a photo, or a lead, can delete it' })
  }
  await photosRepo.remove(db, actor.workshopId, id)
  await removeKeys(store, [photo.thumb_key, photo.display_key])
  emitPhoto(actor, 'photo.deleted', { id, job_id: photo.job_id, shared: photo.shared }, photo.shared)
}

export async function photoFile(actor: Actor, id: string, variant: 'thumb' | 'display', store: Storage = photoStorage()) {
  const photo = await visiblePhoto(useDb(), actor, id)
  const data = await readPhotoFile(store, variant === 'thumb' ? photo.thumb_key : photo.display_key)
  if (!data) notFound('Photo')
  return data
}
