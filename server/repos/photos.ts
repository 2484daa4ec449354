// Every knex call for photos, and the checks that a piece or pour named on an upload belongs
// to the job. Workshop in every WHERE.
import type { Knex } from 'knex'
/** A photos row as PHOTO_COLUMNS read it. */
export interface PhotoRow {
  id: string
  job_id: number
  piece_id: number | null
  pour_id: number | null
  caption: string | null
  shared: boolean
  uploaded_by: number | null
  width: number
  height: number
  bytes: number
  created_at: Date
}

/** Row plus storage keys: only the service sees the keys, routes never return them. */
export interface StoredPhotoRow extends PhotoRow { workshop_id: number; thumb_key: string; display_key: string }

export const PHOTO_COLUMNS = ['id', 'job_id', 'piece_id', 'pour_id', 'caption', 'shared', 'uploaded_by', 'width', 'height', 'bytes', 'created_at'] as const

export interface PhotoInsert {
  jobId: number
  pieceId: number | null
  pourId: number | null
  caption: string | null
  shared: boolean
  uploadedBy: number
  thumbKey: string
  displayKey: string
  width: number
  height: number
  bytes: number
}

export const photosRepo = {
  forJob(db: Knex, workshopId: number, jobId: number, sharedOnly: boolean): Promise<PhotoRow[]> {
    const q = db('photos').select(PHOTO_COLUMNS).where({ workshop_id: workshopId, job_id: jobId })
    if (sharedOnly) q.andWhere('shared', true)
    return q.orderBy([{ column: 'created_at', order: 'desc' }, { column: 'id', order: 'asc' }])
  },
  byId(db: Knex, workshopId: number, id: string): Promise<StoredPhotoRow | undefined> {
    return db('photos').first([...PHOTO_COLUMNS, 'workshop_id', 'thumb_key', 'display_key']).where({ workshop_id: workshopId, id })
  },
  async insert(db: Knex, workshopId: number, p: PhotoInsert): Promise<PhotoRow> {
    const [row] = await db('photos').insert({
      workshop_id: workshopId, job_id: p.jobId, piece_id: p.pieceId, pour_id: p.pourId, caption: p.caption, shared: p.shared,
      uploaded_by: p.uploadedBy, thumb_key: p.thumbKey, display_key: p.displayKey, width: p.width, height: p.height, bytes: p.bytes,
    }).returning(PHOTO_COLUMNS)
    return row
  },
  async update(db: Knex, workshopId: number, id: string, cols: { caption?: string | null; shared?: boolean }): Promise<PhotoRow | undefined> {
    const [row] = await db('photos').where({ workshop_id: workshopId, id }).update({ ...cols, updated_at: db.fn.now() }).returning(PHOTO_COLUMNS)
    return row
  },
  remove(db: Knex, workshopId: number, id: string) {
    return db('photos').where({ workshop_id: workshopId, id }).del()
  },
  /** True when the pour casts an item of this job, in this workshop. */
  async pourInJob(db: Knex, workshopId: number, jobId: number, pourId: number) {
    return !!(await db('pours as p').join('job_items as i', function () {
      this.on('i.id', 'p.job_item_id').andOn('i.workshop_id', 'p.workshop_id')
    }).first('p.id').where({ 'p.workshop_id': workshopId, 'p.id': pourId, 'i.job_id': jobId }))
  },
  /** The piece's pour when the piece belongs to this job, in this workshop. */
  async pieceInJob(db: Knex, workshopId: number, jobId: number, pieceId: number): Promise<{ pour_id: number } | undefined> {
    return db('pieces as c').join('job_items as i', function () {
      this.on('i.id', 'c.job_item_id').andOn('i.workshop_id', 'c.workshop_id')
    }).first('c.pour_id').where({ 'c.workshop_id': workshopId, 'c.id': pieceId, 'i.job_id': jobId })
  },
}
