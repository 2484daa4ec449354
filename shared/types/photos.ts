// What the photo and client progress routes return.
import type { WorkshopLocale } from '../utils/workshop-format'

/** GET /api/jobs/:id/photos (staff), and what an upload or a PATCH answers. */
export interface PhotoDto {
  id: string
  jobId: number
  pieceId: number | null
  pourId: number | null
  caption: string | null
  shared: boolean
  uploadedBy: number | null
  width: number
  height: number
  bytes: number
  createdAt: string
}

/** GET /api/client/jobs/:id/photos: what a client sees of a shared photo, never who took it, nor which pour or piece it shows. */
export interface ClientPhotoDto { id: string; caption: string | null; width: number; height: number; createdAt: string }

export interface ItemProgressDto {
  id: number
  description: string
  piecesNeeded: number
  planned: number
  cast: number
  fettled: number
  dry: number
  dispatched: number
}

/** GET /api/client/jobs/:id/progress */
export interface ClientProgressDto {
  job: { id: number; code: string; title: string; dueOn: string | null }
  items: ItemProgressDto[]
  /** when the last piece is expected ready to dispatch; null unless every piece is planned */
  expectedCompletionAt: string | null
  /** what the page says about completion (shared/utils/client-completion.ts) */
  completion:
    | { kind: 'ready_by'; readyBy: string; timezone: string; locale: WorkshopLocale }
    | { kind: 'not_planned'; notPlanned: number; ordered: number }
    | { kind: 'never_dries' }
    | { kind: 'all_ready' }
  photos: ClientPhotoDto[]
}
