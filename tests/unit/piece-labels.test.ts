// Pieces and labels, pure: where a run piece goes, the next steps by state, reading a scanned code.
import { describe, expect, it } from 'vitest'
import { labelTokenFromScan, labelUrl, pieceNextSteps, pieceRunCutList, pieceRunPlace, pieceRunPlaceWords } from '#shared/utils/piece-labels'

describe('pieceRunPlace', () => {
  it('names the walls each cast length is cut for (hand-worked: two 1.5 m walls from 1.5 m casts, one length each)', () => {
    const cut = pieceRunCutList({ walls: [{ lengthM: 1.5 }, { lengthM: 1.5 }], castLengthM: 1.5, minPieceM: 0.3, sparesPct: 0 })!
    expect(pieceRunPlace(cut, 1)).toEqual({ lengthNo: 1, lengths: 2, walls: [1], hasReturn: false, spare: false })
    expect(pieceRunPlace(cut, 2)).toEqual({ lengthNo: 2, lengths: 2, walls: [2], hasReturn: false, spare: false })
    expect(pieceRunPlaceWords(pieceRunPlace(cut, 2))).toBe('Length 2 of 2 · wall 2')
    expect(pieceRunPlaceWords(pieceRunPlace(cut, 3))).toBe('Spare length (3, the run uses 2)')
  })

  it('has no cut list for an item of no run, or one the model refuses', () => {
    expect(pieceRunCutList({ walls: null, castLengthM: 1.5, minPieceM: 0.3, sparesPct: 0 })).toBeNull()
    expect(pieceRunCutList({ walls: [{ lengthM: 2 }], castLengthM: null, minPieceM: 0.3, sparesPct: 0 })).toBeNull()
    // a 0.2 m wall cannot be cut into pieces of at least 0.3 m
    expect(pieceRunCutList({ walls: [{ lengthM: 0.2 }], castLengthM: 1.5, minPieceM: 0.3, sparesPct: 0 })).toBeNull()
  })
})

describe('pieceNextSteps', () => {
  it('follows FINISHING_STEPS', () => {
    expect(pieceNextSteps('to_fettle')).toEqual(['fettled', 'repair', 'rejected', 'fettle_start', 'fettle_stop'])
    expect(pieceNextSteps('ready')).toEqual(['packed'])
    expect(pieceNextSteps('dispatched')).toEqual([])
  })
})

describe('labelTokenFromScan', () => {
  const token = 'AbCdEfGhIjKlMnOpQrSt_-'
  it('reads the token out of a label address on any host, or a bare token', () => {
    expect(labelTokenFromScan(labelUrl('https://setline.example.test/', 12, token))).toBe(token)
    expect(labelTokenFromScan(`http://10.0.0.5:3000/pieces/12?label=${token}`)).toBe(token)
    expect(labelTokenFromScan(` ${token} `)).toBe(token)
  })
  it('reads nothing from other codes', () => {
    expect(labelTokenFromScan('https://example.test/somewhere?label=' + token)).toBeNull()
    expect(labelTokenFromScan('https://setline.example.test/pieces/12?label=short')).toBeNull()
    expect(labelTokenFromScan('hello')).toBeNull()
  })
})
