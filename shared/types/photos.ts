// Rows the photo and client progress routes return.
export interface PhotoDto {
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
  created_at: string
}

/** What a client sees of a shared photo. */
export interface ClientPhotoDto { id: string; caption: string | null; width: number; height: number; created_at: string }

export interface ItemProgressDto {
  id: number
  description: string
  pieces_needed: number
  planned: number
  cast: number
  fettled: number
  dry: number
  dispatched: number
}

export interface ClientProgressDto {
  job: { id: number; code: string; title: string; due_on: string | null }
  items: ItemProgressDto[]
  /** when the last piece is expected ready to dispatch; null unless every piece is planned */
  expected_completion_at: string | null
  /** what the page says about completion (shared/utils/client-completion.ts) */
  completion:
    | { kind: 'ready_by'; readyBy: string; timezone: string }
    | { kind: 'not_planned'; notPlanned: number; ordered: number }
    | { kind: 'never_dries' }
    | { kind: 'all_ready' }
  photos: ClientPhotoDto[]
}
