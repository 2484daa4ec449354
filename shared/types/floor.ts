// What GET /api/floor/today and POST /api/pours/:id/actions return: a pour as a card on the
// caster's tablet (the board's PourDto plus what a caster needs at the bench).
import type { PourDto } from './board'

export type FloorCaution = 'heat' | 'dust'

export interface FloorCardDto {
  pour: PourDto
  mould: { code: string; casts: string; cavityLitres: number; state: string }
  bench: { id: number; name: string } | null
  actual: {
    mixingAt: string | null
    pouredAt: string | null
    demouldedAt: string | null
    backdated: boolean
    plasterKg: number | null
    waterKg: number | null
    waterTempC: number | null
    powderTempC: number | null
    shopTempC: number | null
    slurryTempC: number | null
    result: 'sound' | 'defect' | null
    defect: string | null
    lotCode: string | null
    pieceMark: string | null
    pieceId: number | null
  }
  /** in-date lots first (oldest received first), then expired ones, marked */
  lots: { id: number; lotCode: string; leftKg: number; useBy: string | null; expired: boolean }[]
  cautions: FloorCaution[]
}

export interface FloorToday { day: string; timezone: string; cards: FloorCardDto[] }

export interface FloorActionResult { card: FloorCardDto; piece: { id: number; mark: string } | null }
