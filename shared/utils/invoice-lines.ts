/**
 * A dispatch note's pieces as the lines of its invoice, before the lead reads them. Pure.
 *
 * The pieces on the note are grouped by the job item they were cast for, one line per item in
 * the order given: its description, the pieces dispatched as the quantity, and a unit price per
 * piece from the item's price. An item made from a quote carries the client's price for the whole
 * item (job_items.price_minor, margin included, before tax: quote-job.ts shares the quote's lines
 * out to its items), spread evenly over the pieces the item needs and rounded once to the minor
 * unit, half away from zero (money.ts). An item without a price (made by hand), and pieces cast
 * for no item, get a line without a price: the lead types it before issuing. Tax and the deposit
 * are the invoice's, not the lines' (services/invoices.ts).
 */
import { assertMinor } from './money'

/** One piece on the note, with the item it was cast for (null: none). */
export interface DispatchedPiece {
  mark: string
  itemId: number | null
  itemDescription: string | null
  /** the pieces the item needs in all (its cast lengths, or its count) */
  itemPieces: number | null
  /** the client's price of the whole item, minor units; null when it has none */
  itemPriceMinor: number | null
  mouldCode: string
}

export interface DraftInvoiceLine {
  description: string
  quantity: number
  /** per piece, minor units; null when the item has no price to go by */
  unitPrice: number | null
  jobItemId: number | null
  marks: string[]
}

/** The item's price per piece, rounded once half away from zero; null without a price or a count. */
export function piecePrice(priceMinor: number | null, pieces: number | null): number | null {
  if (priceMinor === null || !pieces || pieces < 1) return null
  const p = BigInt(assertMinor(priceMinor, 'price'))
  const n = BigInt(pieces)
  return Number((2n * p + n) / (2n * n))
}

export function invoiceLinesFromDispatch(pieces: DispatchedPiece[]): DraftInvoiceLine[] {
  const lines = new Map<string, DraftInvoiceLine>()
  for (const piece of pieces) {
    const key = piece.itemId === null ? `mould:${piece.mouldCode}` : `item:${piece.itemId}`
    let line = lines.get(key)
    if (!line) {
      line = {
        description: piece.itemId === null ? `Pieces cast on mould ${piece.mouldCode}` : (piece.itemDescription || `Pieces cast on mould ${piece.mouldCode}`),
        quantity: 0,
        unitPrice: piece.itemId === null ? null : piecePrice(piece.itemPriceMinor, piece.itemPieces),
        jobItemId: piece.itemId,
        marks: [],
      }
      lines.set(key, line)
    }
    line.quantity++
    line.marks.push(piece.mark)
  }
  return [...lines.values()]
}
