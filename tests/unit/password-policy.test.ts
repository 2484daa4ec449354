// The scrypt options new hashes are made with: OWASP's N = 2^17 unless Nuxt's runtime override
// names another power of two from 2^14 up (the test run uses 2^14).
import { describe, expect, it } from 'vitest'
import { SCRYPT_OPTIONS, scryptOptions } from '../../server/utils/password-policy'

describe('scryptOptions', () => {
  it('is the OWASP cost when nothing is set', () => {
    expect(scryptOptions({})).toEqual(SCRYPT_OPTIONS)
    expect(SCRYPT_OPTIONS.cost).toBe(2 ** 17) // OWASP Password Storage Cheat Sheet, scrypt N = 2^17
  })
  it('takes a power of two from 2^14 up, with the memory bound to match', () => {
    expect(scryptOptions({ NUXT_HASH_SCRYPT_COST: '16384' })).toMatchObject({ cost: 2 ** 14, blockSize: 8, maxMemory: 128 * 2 ** 14 * 8 * 2 })
  })
  it('ignores a weaker, odd or garbled value', () => {
    for (const v of ['1024', '20000', 'cheap', '', String(2 ** 21)]) expect(scryptOptions({ NUXT_HASH_SCRYPT_COST: v })).toEqual(SCRYPT_OPTIONS)
  })
})
