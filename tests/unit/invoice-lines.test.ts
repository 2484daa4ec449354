import { describe, it, expect } from 'vitest'
import { invoiceLinesFromDispatch, piecePrice, type DispatchedPiece } from '#shared/utils/invoice-lines'

// Our own worked example: the items of tests/unit/quote-job.test.ts (prices by hand there):
// the run Egg-and-dart 150 at £666.14 for its 3 lengths, the corbels at £669.45 for 4 pieces,
// and a ceiling centre made by hand on the job page, without a price.
const run = { itemId: 11, itemDescription: 'Egg-and-dart 150, Drawing room', itemPieces: 3, itemPriceMinor: 66614, mouldCode: 'M-EGG' }
const corbel = { itemId: 13, itemDescription: 'Corbel, Hall', itemPieces: 4, itemPriceMinor: 66945, mouldCode: 'M-CORBEL' }
const centre = { itemId: 12, itemDescription: 'Ceiling centre 600', itemPieces: 1, itemPriceMinor: null, mouldCode: 'M-CC' }
const piece = (item: Omit<DispatchedPiece, 'mark'>, mark: string): DispatchedPiece => ({ ...item, mark })

describe('a dispatch note as invoice lines: our own worked example', () => {
  it('prices a piece as its item\'s price over the pieces it needs, rounded once half away from zero', () => {
    expect(piecePrice(66614, 3)).toBe(22205) // 666.14 / 3 = 222.0466… → £222.05
    expect(piecePrice(66945, 4)).toBe(16736) // 669.45 / 4 = 167.3625 → £167.36
    expect(piecePrice(5, 2)).toBe(3) // 2.5 → 3: half away from zero
    expect(piecePrice(null, 3)).toBeNull()
    expect(piecePrice(1000, 0)).toBeNull()
  })

  it('makes one line per job item with the pieces dispatched, in the order given', () => {
    // the note: two of the run's three lengths, all four corbels, the hand-made centre
    const lines = invoiceLinesFromDispatch([
      piece(run, 'EGG-1'), piece(run, 'EGG-2'), piece(centre, 'CC-1'),
      piece(corbel, 'C-1'), piece(corbel, 'C-2'), piece(corbel, 'C-3'), piece(corbel, 'C-4'),
    ])
    expect(lines).toEqual([
      { description: 'Egg-and-dart 150, Drawing room', quantity: 2, unitPrice: 22205, jobItemId: 11, marks: ['EGG-1', 'EGG-2'] },
      { description: 'Ceiling centre 600', quantity: 1, unitPrice: null, jobItemId: 12, marks: ['CC-1'] },
      { description: 'Corbel, Hall', quantity: 4, unitPrice: 16736, jobItemId: 13, marks: ['C-1', 'C-2', 'C-3', 'C-4'] },
    ])
    // 2 × £222.05 = £444.10 and 4 × £167.36 = £669.44: a penny under the corbels' £669.45, the
    // one rounding of the piece price (the lead may correct it before issuing)
  })

  it('keeps pieces cast for no item apart, by mould, without a price', () => {
    const lines = invoiceLinesFromDispatch([
      piece({ itemId: null, itemDescription: null, itemPieces: null, itemPriceMinor: null, mouldCode: 'M-SPARE' }, 'S-1'),
      piece(run, 'EGG-3'),
    ])
    expect(lines).toEqual([
      { description: 'Pieces cast on mould M-SPARE', quantity: 1, unitPrice: null, jobItemId: null, marks: ['S-1'] },
      { description: 'Egg-and-dart 150, Drawing room', quantity: 1, unitPrice: 22205, jobItemId: 11, marks: ['EGG-3'] },
    ])
    expect(invoiceLinesFromDispatch([])).toEqual([])
  })
})
