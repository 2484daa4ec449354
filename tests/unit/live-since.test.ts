// Whether a page read at a given time may have missed a live event before its socket joined
// its rooms (server/utils/live-since.ts): events are noted per room, a room of the socket with an
// event at or after the read (less SKEW_MS) counts, other rooms do not, and what the module can
// no longer vouch for (before it started, or forgotten once the map was swept) counts as missed.
import { describe, expect, it } from 'vitest'
import { KEEP_MS, SKEW_MS, missedSince, noteLiveEvent } from '../../server/utils/live-since'

describe('missedSince', () => {
  const start = Date.now()

  it('counts an event of one of the socket\'s rooms at or after the read, less the clock allowance', () => {
    const t = start + 60_000
    noteLiveEvent(['workshop:1'], t)
    expect(missedSince(['workshop:1', 'user:5'], t)).toBe(true)
    expect(missedSince(['workshop:1'], t + SKEW_MS)).toBe(true)
    expect(missedSince(['workshop:1'], t + SKEW_MS + 1)).toBe(false)
    // another workshop's event, and a job the socket is not in, do not count
    noteLiveEvent(['workshop:2', 'job:9'], t + 5_000)
    expect(missedSince(['workshop:1', 'job:8'], t + 1_000)).toBe(false)
    expect(missedSince(['workshop:3', 'job:9'], t + 1_000)).toBe(true)
  })

  it('cannot vouch for a read with no time, or from before it started hearing', () => {
    expect(missedSince(['workshop:4'], undefined)).toBe(true)
    expect(missedSince(['workshop:4'], 'yesterday')).toBe(true)
    expect(missedSince(['workshop:4'], Number.NaN)).toBe(true)
    expect(missedSince(['workshop:4'], start - 60_000)).toBe(true)
    expect(missedSince(['workshop:4'], start + 30_000)).toBe(false)
  })

  it('forgets quiet rooms once it holds many, and then counts reads from before that as missed', () => {
    const late = start + 2 * KEEP_MS
    // rooms quiet for longer than KEEP_MS, then enough new ones to sweep
    noteLiveEvent(['workshop:5'], start + 1_000)
    for (let i = 0; i < 5_001; i++) noteLiveEvent([`job:${1000 + i}`], late)
    // a read from before the forgotten time is not vouched for, even for a room with no event
    expect(missedSince(['workshop:6'], start + 2_000)).toBe(true)
    // a read after it still is, and the rooms still held still count
    expect(missedSince(['workshop:6'], late - KEEP_MS + SKEW_MS + 1)).toBe(false)
    expect(missedSince(['job:1000'], late - 1)).toBe(true)
  })
})
