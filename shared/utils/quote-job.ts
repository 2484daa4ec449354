/**
 * An accepted quote as a job's items, each with its share of the shop's estimate. Pure.
 *
 * Items follow the take-off: each run of cornice is one run item (its walls with their corners
 * and returns, the profile, the pieces the run calculator cut), each ornament one piece item.
 * The estimate of an item is the estimate of its own casting line, plus the new mould line of its
 * profile or ornament (on the first item that uses it: one mould is made once), plus its share of
 * the lines priced for the whole casting (fettling split by pieces, plaster by kilograms). Lines
 * that belong to the job as a whole and not to any piece (fixing on site, delivery) stay on the
 * quote. Shares are split in integers by the largest remainder, so the items' estimates and the
 * job-wide lines add up to the quote's estimate to the minor unit (Hamilton's method of
 * apportionment, the usual way to split an integer total exactly).
 * The client's price of each item (the lines' amounts, margin included) is shared out the same
 * way, so the items' prices and the job-wide lines add up to the quote's net: a dispatch note's
 * invoice lines are priced from it (invoice-lines.ts).
 */
import { takeOff, type QuoteLine, type TakeOffRoom } from './quote-pricing'
import type { PlasterRunWall } from './plaster-cutlist'

export interface QuoteJobItem {
  kind: 'run' | 'pieces'
  description: string
  profile: string
  /** a run's walls, corners and returns as the take-off gave them */
  walls: PlasterRunWall[] | null
  minPieceM: number | null
  /** a run's projection, saw cut and corner-block leg, m, as the take-off gave them (null for an ornament) */
  projectionM: number | null
  sawCutM: number | null
  cornerBlockLegM: number | null
  sparesPct: number
  /** pieces to cast: the run calculator's lengths for a run, the count for an ornament */
  pieces: number
  quantity: number | null
  estimateMinor: number
  /** the client's price for the item (margin included, before tax), shared out like the estimate */
  priceMinor: number
}

export interface QuoteJob {
  items: QuoteJobItem[]
  /** the estimate of the lines that stay with the whole job (fixing, delivery) */
  jobWideEstimate: number
  /** the client's price of those lines */
  jobWidePrice: number
}

/** Splits an integer total by integer weights, exactly: floors, then the largest remainders get one more. */
export function apportion(total: number, weights: number[]): number[] {
  const sum = weights.reduce((a, w) => a + BigInt(w), 0n)
  if (sum === 0n) return weights.map((_, i) => (i === 0 ? total : 0))
  const t = BigInt(total)
  const parts = weights.map((w, i) => ({ i, floor: (t * BigInt(w)) / sum, rem: (t * BigInt(w)) % sum }))
  let left = t - parts.reduce((a, p) => a + p.floor, 0n)
  const out = parts.map(p => p.floor)
  for (const p of [...parts].sort((a, b) => (b.rem > a.rem ? 1 : b.rem < a.rem ? -1 : a.i - b.i))) {
    if (left <= 0n) break
    out[p.i]! += 1n
    left -= 1n
  }
  return out.map(Number)
}

export function quoteToJobItems(takeOffInput: { rooms: TakeOffRoom[]; bagKg: number }, lines: QuoteLine[]): QuoteJob {
  const t = takeOff(takeOffInput.rooms, takeOffInput.bagKg)
  const runs = takeOffInput.rooms.flatMap(room => room.runs)
  const castLengths = lines.filter(l => l.kind === 'cast-length')
  const castPieces = lines.filter(l => l.kind === 'cast-piece')
  const items: QuoteJobItem[] = [
    ...t.runs.map((r, n): QuoteJobItem => ({
      kind: 'run', description: `${r.profile}, ${r.room}`, profile: r.profile, walls: runs[n]!.walls,
      minPieceM: runs[n]!.minPieceM, sparesPct: runs[n]!.sparesPct, pieces: r.lengths, quantity: null,
      projectionM: runs[n]!.projectionM ?? null, sawCutM: runs[n]!.sawCutM ?? null, cornerBlockLegM: runs[n]!.cornerBlockLegM ?? null,
      estimateMinor: castLengths[n]?.estimate ?? 0, priceMinor: castLengths[n]?.amount ?? 0,
    })),
    ...t.ornaments.map((o, n): QuoteJobItem => ({
      kind: 'pieces', description: `${o.name}, ${o.room}`, profile: o.name, walls: null, minPieceM: null, sparesPct: 0,
      projectionM: null, sawCutM: null, cornerBlockLegM: null,
      pieces: o.count, quantity: o.count, estimateMinor: castPieces[n]?.estimate ?? 0, priceMinor: castPieces[n]?.amount ?? 0,
    })),
  ]
  const kg = [...t.runs.map(r => r.plasterKg), ...t.ornaments.map(o => o.plasterKg)]
  const add = (amounts: number[], price: number[]) => amounts.forEach((a, i) => {
    items[i]!.estimateMinor += a
    items[i]!.priceMinor += price[i]!
  })
  for (const line of lines) {
    if (line.kind === 'mould') {
      const name = line.description.replace(/^New mould: /, '')
      const first = items.findIndex(i => i.profile === name)
      if (first >= 0) {
        items[first]!.estimateMinor += line.estimate
        items[first]!.priceMinor += line.amount
      }
    }
    else if (line.kind === 'fettle') {
      const w = items.map(i => i.pieces)
      add(apportion(line.estimate, w), apportion(line.amount, w))
    }
    else if (line.kind === 'plaster') {
      // grams as integer weights: kilograms to three places are exact enough to split pence
      const w = kg.map(k => Math.round(k * 1000))
      add(apportion(line.estimate, w), apportion(line.amount, w))
    }
  }
  const jobWide = lines.filter(l => l.kind === 'fixing' || l.kind === 'delivery')
  return { items, jobWideEstimate: jobWide.reduce((a, l) => a + l.estimate, 0), jobWidePrice: jobWide.reduce((a, l) => a + l.amount, 0) }
}
