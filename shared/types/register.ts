// GET /api/jobs/:id/register: one page of a job's casting register; the export
// (register/export.get.ts) writes the same rows under its own column headers. Times come as local 'YYYY-MM-DD HH:MM' (formatted by
// PostgreSQL in the workshop's zone); NUMERIC as numbers (the driver's parser, server/utils/db.ts).

// a type alias, not an interface: sendCsvRows takes Record<string, unknown> rows
export type RegisterRow = {
  pourId: number
  state: string
  isSample: boolean
  /** every piece's mark, space-separated, in cavity order */
  mark: string | null
  /** the piece's id, for its page (the CSV leaves it out) */
  pieceId: number | null
  pieceState: string | null
  item: string
  mould: string
  /** pieces the pour makes (its mould's cavities) */
  cavities: number
  grade: string
  lot: string | null
  consistency: number
  plasterKgActual: number | null
  waterKgActual: number | null
  waterTempC: number | null
  powderTempC: number | null
  shopTempC: number | null
  slurryTempC: number | null
  mixPlanned: string
  mixingAt: string | null
  pouredAt: string | null
  demouldOpen: string
  demouldClose: string
  demouldedAt: string | null
  caster: string | null
  result: string | null
  defect: string | null
  backdated: boolean
  photos: number
}

export interface RegisterPageDto {
  job: { id: number; code: string; title: string }
  page: number
  pageSize: number
  total: number
  rows: RegisterRow[]
  moulds: { id: number; code: string }[]
  casters: { id: number; name: string }[]
}
