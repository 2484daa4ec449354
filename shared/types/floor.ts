// What GET /api/floor/today and POST /api/pours/:id/actions return: a pour as a card on the
// caster's tablet (the board's PourDto plus what a caster needs at the bench).
import type { PourDto } from './board'
import type { CastType } from '../utils/plaster-fibrous'

export type FloorCaution = 'heat' | 'dust'

export interface FloorCardDto {
  pour: PourDto
  mould: { code: string; casts: string; cavityLitres: number; state: string; cavities: number; castType: CastType }
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
    /** the pour's pieces as one label (J-2601#017–#020 for a 4-cavity mould) */
    pieceMark: string | null
    /** the first piece (photos go to it) */
    pieceId: number | null
    pieceMarks: string[]
  }
  /** in-date lots first (oldest received first), then expired ones, marked */
  lots: { id: number; lotCode: string; leftKg: number; useBy: string | null; expired: boolean }[]
  cautions: FloorCaution[]
}

export interface FloorToday { day: string; timezone: string; cards: FloorCardDto[] }

/** `piece`: the first piece a demould made; `pieces`: all of them (one per cavity of the mould). */
export interface FloorActionResult { card: FloorCardDto; piece: { id: number; mark: string } | null; pieces: { id: number; mark: string }[] }
