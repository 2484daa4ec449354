// Pieces and their labels, pure: where a run piece goes (its length in the run's cut list and
// the walls it is cut for), the finishing steps a piece can take now, and the label's token and
// address. Shared by the server (label data, scans) and the tablet (the scanner reads the token
// back out of the address). Nuxt auto-imports every export of shared/utils, so names carry a
// piece or label prefix.
import { runCutList, type PlasterRunCutList } from './plaster-cutlist'
import { FINISHING_ACTION_KINDS, FINISHING_STEPS, type FinishingActionKind, type FinishingPieceState } from './finishing-steps'

/**
 * A label token: 16 random bytes in base64url (22 characters), short enough for a small QR code.
 * Here rather than beside the route's schema (label-schemas.ts) so the tablet's scanner checks
 * it without loading zod.
 */
export const LABEL_TOKEN_PATTERN = /^[\w-]{22}$/

/**
 * Where a run piece goes: the `lengthNo`-th cast length of the item (1-based, in cast order,
 * rejected casts not counted) of `lengths` the run uses, the walls (1-based, as the job lists
 * them) its cuts are for, and whether a return piece comes out of it. A length past the run's
 * used lengths is a spare. A label printed before an earlier cast of the item was rejected
 * may name the wrong length afterwards: print it again.
 */
export interface PieceRunPlace {
  lengthNo: number
  lengths: number
  walls: number[]
  hasReturn: boolean
  spare: boolean
}

export function pieceRunPlace(cutList: PlasterRunCutList, lengthNo: number): PieceRunPlace {
  const cuts = cutList.cuts.filter(c => c.fromLength === lengthNo - 1)
  return {
    lengthNo,
    lengths: cutList.usedLengths,
    walls: [...new Set(cuts.map(c => c.wall + 1))].sort((a, b) => a - b),
    hasReturn: cuts.some(c => c.kind === 'return'),
    spare: lengthNo > cutList.usedLengths,
  }
}

/** The run's cut list for a piece's item, or null when the item is no run or the model refuses it (the job page shows why). */
export function pieceRunCutList(item: { walls: { lengthM: number }[] | null; castLengthM: number | null; minPieceM: number; sparesPct: number }): PlasterRunCutList | null {
  if (!item.walls?.length || !item.castLengthM) return null
  try {
    return runCutList({ walls: item.walls, castLengthM: item.castLengthM, minPieceM: item.minPieceM, sparesPct: item.sparesPct })
  }
  catch {
    return null
  }
}

/** The place in words, as the label and the piece page print it: "Length 3 of 7 · walls 2, 3". */
export function pieceRunPlaceWords(p: PieceRunPlace): string {
  if (p.spare) return `Spare length (${p.lengthNo}, the run uses ${p.lengths})`
  const walls = p.walls.length ? ` · wall${p.walls.length > 1 ? 's' : ''} ${p.walls.join(', ')}` : ''
  return `Length ${p.lengthNo} of ${p.lengths}${walls}${p.hasReturn ? ' · and a return' : ''}`
}

/** The finishing steps a piece in this state can take now (FINISHING_STEPS), in the tablet's order. */
export function pieceNextSteps(state: FinishingPieceState): FinishingActionKind[] {
  return FINISHING_ACTION_KINDS.filter(k => FINISHING_STEPS[k].from.includes(state))
}

/** The address a label's QR code carries: the piece page, with the label's token. */
export function labelUrl(appUrl: string, pieceId: number, token: string) {
  return `${appUrl.replace(/\/+$/, '')}/pieces/${pieceId}?label=${token}`
}

/**
 * The token out of a scanned code: a Setline label address (any host: a tablet may reach the
 * server by another name than the one printed) or the bare token. Null for anything else.
 */
export function labelTokenFromScan(text: string): string | null {
  const bare = text.trim()
  if (LABEL_TOKEN_PATTERN.test(bare)) return bare
  try {
    const url = new URL(bare)
    const token = url.searchParams.get('label')
    return /^\/pieces\/\d+$/.test(url.pathname) && token && LABEL_TOKEN_PATTERN.test(token) ? token : null
  }
  catch {
    return null
  }
}
