/**
 * Run cut list (walls → cast lengths) and bag requisition. Re-exported from `plaster.ts`. Pure.
 */
import { PLASTER_LIMITS, PlasterInputError, assertPlasterNumber, assertPlasterObject } from './plaster-core'

/** Tolerance for length arithmetic, m: far below a saw cut, far above float rounding. */
const LENGTH_EPS = 1e-9

/** Most wall segments a cut list handles, to keep a request's work bounded (common practice). */
const MAX_SEGMENTS = 5000

/** One piece cut from a cast length. `wall` and `fromLength` are 0-based indices. */
export interface PlasterRunCut {
  wall: number
  fromLength: number
  lengthM: number
}

/** Result of `runCutList`. `lengths` includes the spares. */
export interface PlasterRunCutList {
  lengths: number
  cuts: PlasterRunCut[]
  offcutM: number
  usedLengths: number
  spareLengths: number
}

/**
 * Splits one wall into segments of minPiece..cast metres: as many full cast lengths as fit, then
 * the remainder; a remainder shorter than minPiece is balanced with the last full length into two
 * equal pieces, or, when even that is too short, the wall is split into equal pieces.
 */
function splitWall(lengthM: number, cast: number, min: number, field: string): number[] {
  const k = Math.max(1, Math.ceil(lengthM / cast - LENGTH_EPS))
  if (k * min > lengthM + LENGTH_EPS) {
    throw new PlasterInputError(field, `${field} (${lengthM} m) cannot be cut into pieces of ${min}–${cast} m: make the shortest piece shorter`)
  }
  const rest = lengthM - (k - 1) * cast
  let pieces: number[]
  if (rest >= min - LENGTH_EPS) {
    pieces = Array<number>(k).fill(cast)
  }
  else if ((cast + rest) / 2 >= min - LENGTH_EPS) {
    pieces = [...Array<number>(k - 2).fill(cast), (cast + rest) / 2, 0]
  }
  else {
    pieces = Array<number>(k).fill(lengthM / k)
  }
  // The last piece takes whatever is left, so the pieces sum to the wall exactly.
  pieces[k - 1] = lengthM - pieces.slice(0, -1).reduce((a, b) => a + b, 0)
  return pieces
}

function checkWalls(walls: unknown): number[] {
  if (!Array.isArray(walls) || walls.length < 1 || walls.length > 1000) {
    throw new PlasterInputError('walls', 'walls must list 1 to 1000 walls')
  }
  return walls.map((w: unknown, i) => assertPlasterNumber(
    assertPlasterObject(w, `walls[${i}]`).lengthM, `walls[${i}].lengthM`, PLASTER_LIMITS.wallLengthM))
}

/**
 * Cut list for a run of cornice: each wall is split into segments no shorter than `minPieceM` and
 * no longer than `castLengthM` (see splitWall), then the segments are packed into cast lengths by
 * first-fit decreasing: longest first, each into the first cast length whose offcut still holds
 * it, else a new length. Offcuts are thereby reused across walls (for pattern-matched runs, cut
 * per wall instead). Saw kerf is ignored. Spares = ceil(used × sparesPct / 100).
 * Cuts are listed wall by wall in run order; `offcutM` is the total left over in the used lengths.
 */
export function runCutList(input: {
  walls: { lengthM: number }[]
  castLengthM: number
  minPieceM: number
  sparesPct: number
}): PlasterRunCutList {
  const i = assertPlasterObject(input, 'input')
  const cast = assertPlasterNumber(i.castLengthM, 'castLengthM', PLASTER_LIMITS.castLengthM)
  const min = assertPlasterNumber(i.minPieceM, 'minPieceM', { ...PLASTER_LIMITS.minPieceM, max: cast })
  const spares = assertPlasterNumber(i.sparesPct, 'sparesPct', PLASTER_LIMITS.sparesPct)
  const walls = checkWalls(i.walls)
  const segmentCount = walls.reduce((n, l) => n + Math.ceil(l / cast), 0)
  if (segmentCount > MAX_SEGMENTS) {
    throw new PlasterInputError('walls', `walls need more than ${MAX_SEGMENTS} pieces; split the job`)
  }
  const segments = walls.flatMap((l, wall) => splitWall(l, cast, min, `walls[${wall}].lengthM`)
    .map(lengthM => ({ wall, lengthM })))
  const order = segments.map((s, seq) => ({ ...s, seq }))
    .sort((a, b) => b.lengthM - a.lengthM || a.seq - b.seq)
  const left: number[] = []
  const placed = order.map((s) => {
    let from = left.findIndex(r => r >= s.lengthM - LENGTH_EPS)
    if (from < 0) from = left.push(cast) - 1
    left[from] = left[from]! - s.lengthM
    return { seq: s.seq, cut: { wall: s.wall, fromLength: from, lengthM: s.lengthM } }
  })
  const cuts = placed.sort((a, b) => a.seq - b.seq).map(p => p.cut)
  const spareLengths = Math.ceil((left.length * spares) / 100 - LENGTH_EPS)
  return {
    lengths: left.length + spareLengths,
    cuts,
    offcutM: left.reduce((a, r) => a + Math.max(0, r), 0),
    usedLengths: left.length,
    spareLengths,
  }
}

/** Whole bags to cover `kg` of plaster, rounded up (a bag is opened whole). 0 kg needs 0 bags. */
export function bagsForKg(kg: number, bagKg: number): number {
  const need = assertPlasterNumber(kg, 'kg', PLASTER_LIMITS.kg)
  const bag = assertPlasterNumber(bagKg, 'bagKg', PLASTER_LIMITS.bagKg)
  // The tolerance keeps 50 / 25 from rounding up to 3 through float error.
  return Math.max(0, Math.ceil(need / bag - 1e-9))
}
