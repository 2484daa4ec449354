/**
 * Run cut list (walls → cast lengths) and bag requisition. Re-exported from `plaster.ts`. Pure.
 *
 * Corners and ends (common practice for run cornice; no published standard):
 * - an external corner is mitred: the cornice's face runs past the wall line by its projection,
 *   so each of the two walls meeting there takes a piece longer by the projection;
 * - an internal corner is mitred (or scribed) at the wall line and adds nothing, unless the run
 *   uses corner blocks: then a pre-cast block sits in the corner and each wall's run stops short
 *   of it by the block's leg;
 * - a return stops a run on a free end by turning it back to the wall: the wall's piece is
 *   mitred like an external corner (longer by the projection) and a short return piece, as long
 *   as the projection, closes it. Return pieces are cut from offcuts where one will do and are
 *   the one piece allowed below the shortest piece (a return is as long as the cornice is deep).
 * - every cut that leaves an offcut costs a saw cut (kerf); a piece that takes the rest of a
 *   length needs no further cut.
 */
import { PLASTER_LIMITS, PlasterInputError, assertPlasterNumber, assertPlasterObject } from './plaster-core'

/** Tolerance for length arithmetic, m: far below a saw cut, far above float rounding. */
const LENGTH_EPS = 1e-9

/** Most wall segments a cut list handles, to keep a request's work bounded (common practice). */
const MAX_SEGMENTS = 5000

/** How one end of a wall's run finishes. `square`: it butts into something (the default). */
export const RUN_ENDS = ['square', 'internal', 'external', 'return'] as const
export type PlasterRunEnd = (typeof RUN_ENDS)[number]

/** One wall of a run: its length along the wall line and how its two ends finish. */
export interface PlasterRunWall {
  lengthM: number
  start?: PlasterRunEnd
  end?: PlasterRunEnd
}

/**
 * One piece cut from a cast length. `wall` and `fromLength` are 0-based indices; `kind` is
 * `wall` for the run along a wall, `return` for a return piece at that wall's end.
 */
export interface PlasterRunCut {
  wall: number
  fromLength: number
  lengthM: number
  kind: 'wall' | 'return'
}

/** Result of `runCutList`. `lengths` includes the spares. */
export interface PlasterRunCutList {
  lengths: number
  cuts: PlasterRunCut[]
  offcutM: number
  usedLengths: number
  spareLengths: number
  /** per wall, the run its pieces cover: the wall plus projections at mitres, less corner-block legs */
  runM: number[]
  /** corner blocks to cast: one per internal corner when the run uses blocks (two internal ends make one corner) */
  cornerBlocks: number
  /** saw cuts made across all lengths */
  sawCuts: number
}

export interface PlasterRunInput {
  walls: PlasterRunWall[]
  castLengthM: number
  minPieceM: number
  sparesPct: number
  /** how far the cornice stands off the wall, m: needed for external corners and returns */
  projectionM?: number
  /** saw kerf lost per cut, m (0 when omitted) */
  sawCutM?: number
  /** when set, internal corners take a corner block whose leg along each wall is this, m */
  cornerBlockLegM?: number
}

/**
 * Splits one wall into segments of minPiece..cast metres: as many full cast lengths as fit, then
 * the remainder; a remainder shorter than minPiece is balanced with the last full length into two
 * equal pieces, or, when even that is too short, the wall is split into equal pieces.
 */
function splitWall(lengthM: number, cast: number, min: number, field: string): number[] {
  const k = Math.max(1, Math.ceil(lengthM / cast - LENGTH_EPS))
  if (k * min > lengthM + LENGTH_EPS) {
    throw new PlasterInputError(field, `${field} (${round(lengthM)} m) cannot be cut into pieces of ${min}–${cast} m: make the shortest piece shorter`)
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

const round = (m: number) => Math.round(m * 1000) / 1000

function checkEnd(v: unknown, field: string): PlasterRunEnd {
  if (v === undefined) return 'square'
  if (typeof v !== 'string' || !(RUN_ENDS as readonly string[]).includes(v)) {
    throw new PlasterInputError(field, `${field} must be one of ${RUN_ENDS.join(', ')}`)
  }
  return v as PlasterRunEnd
}

function checkWalls(walls: unknown): Required<PlasterRunWall>[] {
  if (!Array.isArray(walls) || walls.length < 1 || walls.length > 1000) {
    throw new PlasterInputError('walls', 'walls must list 1 to 1000 walls')
  }
  return walls.map((w: unknown, i) => {
    const o = assertPlasterObject(w, `walls[${i}]`)
    return {
      lengthM: assertPlasterNumber(o.lengthM, `walls[${i}].lengthM`, PLASTER_LIMITS.wallLengthM),
      start: checkEnd(o.start, `walls[${i}].start`),
      end: checkEnd(o.end, `walls[${i}].end`),
    }
  })
}

/** The cast lengths in use: what is left of each (the offcut) as pieces are cut from them. */
class Stock {
  left: number[] = []
  sawCuts = 0
  constructor(readonly cast: number, readonly kerf: number) {}

  /** Whether `piece` can come from what is left of length `i` (a piece taking the rest needs no cut). */
  holds(i: number, piece: number): boolean {
    const r = this.left[i]!
    return r >= piece - LENGTH_EPS && (r <= piece + LENGTH_EPS || r >= piece + this.kerf - LENGTH_EPS)
  }

  take(i: number, piece: number): number {
    const r = this.left[i]!
    if (r <= piece + LENGTH_EPS) this.left[i] = 0
    else {
      this.left[i] = Math.max(0, r - piece - this.kerf)
      this.sawCuts++
    }
    return i
  }

  open(): number {
    return this.left.push(this.cast) - 1
  }
}

interface Piece { wall: number; lengthM: number; kind: 'wall' | 'return'; seq: number }

/**
 * Today's rule: each wall split on its own (splitWall), then all pieces packed first-fit
 * decreasing into cast lengths.
 */
function packSplit(runs: number[], returns: Piece[], cast: number, min: number, kerf: number) {
  const stock = new Stock(cast, kerf)
  const pieces: Piece[] = runs.flatMap((l, wall) => splitWall(l, cast, min, `walls[${wall}].lengthM`)
    .map(lengthM => ({ wall, lengthM, kind: 'wall' as const, seq: 0 })))
  pieces.push(...returns)
  pieces.forEach((p, seq) => {
    p.seq = seq
  })
  const order = [...pieces].sort((a, b) => b.lengthM - a.lengthM || a.seq - b.seq)
  const placed = order.map((p) => {
    let from = stock.left.findIndex((_, i) => stock.holds(i, p.lengthM))
    if (from < 0) from = stock.open()
    return { seq: p.seq, cut: { wall: p.wall, fromLength: stock.take(from, p.lengthM), lengthM: p.lengthM, kind: p.kind } }
  })
  return { stock, cuts: placed.sort((a, b) => a.seq - b.seq).map(p => p.cut) }
}

/**
 * Offcuts first: walls longest first, each covered piece by piece, taking the offcut that holds
 * the rest of the wall whole (smallest such), else the longest usable offcut for part of it (as
 * long as what is left of the wall can still be cut no shorter than the minimum), else a new
 * length. Returns go last into the smallest offcut that holds them. Null when a wall cannot be
 * covered this way (the caller keeps the even split).
 */
function packOffcutsFirst(runs: number[], returns: Piece[], cast: number, min: number, kerf: number) {
  const stock = new Stock(cast, kerf)
  const cuts: PlasterRunCut[] = []
  // A usable offcut is no shorter than the shortest piece (and not sawdust when that is 0).
  const usable = Math.max(min, 0.001)
  const walls = runs.map((l, wall) => ({ l, wall })).sort((a, b) => b.l - a.l || a.wall - b.wall)
  const cut = (wall: number, from: number, lengthM: number, kind: 'wall' | 'return') =>
    cuts.push({ wall, fromLength: stock.take(from, lengthM), lengthM, kind })
  const smallestHolding = (piece: number) => {
    let best = -1
    stock.left.forEach((r, i) => {
      if (stock.holds(i, piece) && (best < 0 || r < stock.left[best]!)) best = i
    })
    return best
  }
  for (const { l, wall } of walls) {
    let rest = l
    for (let guard = 0; rest > LENGTH_EPS; guard++) {
      if (guard > MAX_SEGMENTS) return null
      const whole = rest <= cast + LENGTH_EPS ? smallestHolding(rest) : -1
      if (whole >= 0) {
        cut(wall, whole, rest, 'wall')
        break
      }
      // the longest offcut that can take part of the wall and leave a cuttable rest
      let part = -1
      let partLen = 0
      stock.left.forEach((r, i) => {
        const piece = Math.min(r, rest - min)
        if (piece >= usable - LENGTH_EPS && stock.holds(i, piece) && piece > partLen) {
          part = i
          partLen = piece
        }
      })
      if (part >= 0 && rest - partLen <= cast + LENGTH_EPS) {
        cut(wall, part, partLen, 'wall')
        rest -= partLen
        continue
      }
      // a new length: all of the rest when it fits, else a full length or as much as leaves the minimum
      let piece: number
      if (rest <= cast + LENGTH_EPS) piece = rest
      else if (rest - cast >= min - LENGTH_EPS) piece = cast
      else if (rest - min >= min - LENGTH_EPS) piece = rest - min
      else return null
      cut(wall, stock.open(), piece, 'wall')
      rest -= piece
    }
  }
  for (const r of [...returns].sort((a, b) => b.lengthM - a.lengthM)) {
    let from = smallestHolding(r.lengthM)
    if (from < 0) from = stock.open()
    cut(r.wall, from, r.lengthM, 'return')
  }
  // listed wall by wall in run order, a wall's returns after its run pieces (the sort is stable)
  return {
    stock,
    cuts: cuts.sort((a, b) => a.wall - b.wall || (a.kind === b.kind ? 0 : a.kind === 'wall' ? -1 : 1)),
  }
}

/**
 * Cut list for a run of cornice. Each wall's run is its length plus the projection at each
 * external corner or return, less the block's leg at each internal corner with a block (see the
 * header). Two ways are tried and the one needing fewer cast lengths is kept (on a tie the
 * first):
 * 1. each wall split on its own into pieces of minPieceM..castLengthM (splitWall), then packed
 *    longest first into the first cast length whose offcut still holds it;
 * 2. offcuts first: each wall covered from the offcuts already left before a new length is
 *    started (packOffcutsFirst). Worked example: walls 5.0 and 3.1 m with 3 m lengths take
 *    3 + 2 | 1 + 2.1 → 3 lengths where the first way needs 4.
 * Saw kerf (`sawCutM`) is taken from the length at every cut that leaves an offcut.
 * Spares = ceil(used × sparesPct / 100). Cuts are listed wall by wall in run order; `offcutM`
 * is the total left over in the used lengths (after kerf). For pattern-matched runs, cut per wall.
 */
export function runCutList(input: PlasterRunInput): PlasterRunCutList {
  const i = assertPlasterObject(input, 'input')
  const cast = assertPlasterNumber(i.castLengthM, 'castLengthM', PLASTER_LIMITS.castLengthM)
  const min = assertPlasterNumber(i.minPieceM, 'minPieceM', { ...PLASTER_LIMITS.minPieceM, max: cast })
  const spares = assertPlasterNumber(i.sparesPct, 'sparesPct', PLASTER_LIMITS.sparesPct)
  const kerf = i.sawCutM === undefined ? 0 : assertPlasterNumber(i.sawCutM, 'sawCutM', { ...PLASTER_LIMITS.sawCutM, max: Math.min(PLASTER_LIMITS.sawCutM.max, cast) })
  const walls = checkWalls(i.walls)
  const mitres = walls.map(w => [w.start, w.end].filter(e => e === 'external' || e === 'return').length)
  const internals = walls.map(w => [w.start, w.end].filter(e => e === 'internal').length)
  const needsProjection = mitres.some(n => n > 0)
  const projection = i.projectionM === undefined && !needsProjection
    ? 0
    : assertPlasterNumber(i.projectionM, 'projectionM', PLASTER_LIMITS.projectionM)
  const blockLeg = i.cornerBlockLegM === undefined ? 0 : assertPlasterNumber(i.cornerBlockLegM, 'cornerBlockLegM', PLASTER_LIMITS.cornerBlockLegM)
  const runs = walls.map((w, n) => {
    const run = w.lengthM + mitres[n]! * projection - internals[n]! * blockLeg
    if (run <= LENGTH_EPS) {
      throw new PlasterInputError(`walls[${n}].lengthM`, `walls[${n}].lengthM (${w.lengthM} m) is no longer than its corner blocks`)
    }
    return run
  })
  const segmentCount = runs.reduce((n, l) => n + Math.ceil(l / cast), 0)
  if (segmentCount > MAX_SEGMENTS) {
    throw new PlasterInputError('walls', `walls need more than ${MAX_SEGMENTS} pieces; split the job`)
  }
  if (projection > cast + LENGTH_EPS && walls.some(w => w.start === 'return' || w.end === 'return')) {
    throw new PlasterInputError('projectionM', 'projectionM is longer than a cast length, so a return cannot be cut')
  }
  const returns: Piece[] = walls.flatMap((w, wall) => [w.start, w.end].filter(e => e === 'return')
    .map(() => ({ wall, lengthM: projection, kind: 'return' as const, seq: 0 })))
  const split = packSplit(runs, returns, cast, min, kerf)
  const offcutsFirst = packOffcutsFirst(runs, returns, cast, min, kerf)
  const best = offcutsFirst && offcutsFirst.stock.left.length < split.stock.left.length ? offcutsFirst : split
  const used = best.stock.left.length
  const spareLengths = Math.ceil((used * spares) / 100 - LENGTH_EPS)
  return {
    lengths: used + spareLengths,
    cuts: best.cuts,
    offcutM: best.stock.left.reduce((a, r) => a + Math.max(0, r), 0),
    usedLengths: used,
    spareLengths,
    runM: runs,
    cornerBlocks: blockLeg > 0 ? Math.ceil(internals.reduce((a, b) => a + b, 0) / 2) : 0,
    sawCuts: best.stock.sawCuts,
  }
}

/** Whole bags to cover `kg` of plaster, rounded up (a bag is opened whole). 0 kg needs 0 bags. */
export function bagsForKg(kg: number, bagKg: number): number {
  const need = assertPlasterNumber(kg, 'kg', PLASTER_LIMITS.kg)
  const bag = assertPlasterNumber(bagKg, 'bagKg', PLASTER_LIMITS.bagKg)
  // The tolerance keeps 50 / 25 from rounding up to 3 through float error.
  return Math.max(0, Math.ceil(need / bag - 1e-9))
}
