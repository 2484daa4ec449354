// The client address behind a reverse proxy: only the right-most X-Forwarded-For entry (the
// one our proxy appended) counts; the rest came with the request.
import { describe, expect, it } from 'vitest'
import { rightmostForwardedFor } from '../../server/utils/forwarded-for'

describe('rightmostForwardedFor', () => {
  it('takes the right-most entry, never the client-supplied ones to its left', () => {
    expect(rightmostForwardedFor('198.51.100.1, 203.0.113.9')).toBe('203.0.113.9')
    expect(rightmostForwardedFor('203.0.113.9')).toBe('203.0.113.9')
    // repeated headers arrive joined in order, or as a list
    expect(rightmostForwardedFor(['198.51.100.1', '203.0.113.9'])).toBe('203.0.113.9')
    expect(rightmostForwardedFor('10.0.0.1,2001:db8::7')).toBe('2001:db8::7')
  })

  it('drops a port and IPv6 brackets', () => {
    expect(rightmostForwardedFor('203.0.113.9:51234')).toBe('203.0.113.9')
    expect(rightmostForwardedFor('[2001:db8::7]:443')).toBe('2001:db8::7')
    expect(rightmostForwardedFor('[2001:db8::7]')).toBe('2001:db8::7')
  })

  it('gives nothing for an absent, empty or non-address entry (the socket address is used then)', () => {
    expect(rightmostForwardedFor(undefined)).toBeUndefined()
    expect(rightmostForwardedFor('')).toBeUndefined()
    expect(rightmostForwardedFor(' , ')).toBeUndefined()
    expect(rightmostForwardedFor('203.0.113.9, unknown')).toBeUndefined()
    expect(rightmostForwardedFor('203.0.113.9, 999.1.1.1')).toBeUndefined()
    expect(rightmostForwardedFor('[203.0.113.9]')).toBeUndefined()
  })
})
