// Choosing the answer's coding from Accept-Encoding (RFC 9110 §12.5.3) and which types are
// worth compressing (server/utils/compression.ts).
import { describe, expect, it } from 'vitest'
import { isCompressibleType, pickCoding } from '../../server/utils/compression'

describe('pickCoding', () => {
  it.each([
    [undefined, undefined],
    ['', undefined],
    ['identity', undefined],
    ['gzip', 'gzip'],
    ['br', 'br'],
    // what Chrome sends: brotli wins the tie
    ['gzip, deflate, br, zstd', 'br'],
    // a higher q wins over the tie-break
    ['br;q=0.5, gzip;q=0.9', 'gzip'],
    ['BR;Q=1, GZIP;Q=0.1', 'br'],
    // q=0 refuses a coding (RFC 9110 §12.5.3)
    ['br;q=0, gzip', 'gzip'],
    ['br;q=0, gzip;q=0', undefined],
    // * stands for the codings not named
    ['*', 'br'],
    ['br;q=0, *', 'gzip'],
    ['*;q=0', undefined],
    ['deflate', undefined],
    ['gzip;q=nonsense', undefined],
  ])('%j → %s', (header, coding) => {
    expect(pickCoding(header)).toBe(coding)
  })
})

describe('isCompressibleType', () => {
  it.each([
    ['application/json', true],
    ['application/json; charset=utf-8', true],
    ['text/html;charset=utf-8', true],
    ['text/csv', true],
    ['image/svg+xml', true],
    ['application/problem+json', true],
    ['text/event-stream', false],
    ['image/jpeg', false],
    ['font/woff2', false],
    ['application/octet-stream', false],
    [undefined, false],
  ])('%s → %s', (type, yes) => {
    expect(isCompressibleType(type)).toBe(yes)
  })
})
