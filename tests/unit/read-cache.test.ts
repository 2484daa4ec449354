// The busiest reads' kept answers (server/utils/read-cache.ts): one read shared by everyone who
// asks at once, kept for READ_CACHE_MS, per workshop, dropped on a change, and a read under
// way at the change never kept.
import { beforeAll, describe, expect, it } from 'vitest'

let cache: typeof import('../../server/utils/read-cache')
const TTL_MS = 200

beforeAll(async () => {
  process.env.READ_CACHE_MS = String(TTL_MS)
  cache = await import('../../server/utils/read-cache')
})

/** A read that counts its calls and answers what `value()` says when it is let go. */
function counted(value: () => string) {
  const calls: { release: () => void }[] = []
  const read = () => new Promise<string>((resolve) => {
    calls.push({ release: () => resolve(value()) })
  })
  return { read, calls }
}
const settle = () => new Promise(r => setTimeout(r, 0))

describe('cachedRead', () => {
  it('makes one read for everyone who asks while it is made, and answers from it within READ_CACHE_MS', async () => {
    const { read, calls } = counted(() => 'day 1')
    const asked = [cache.cachedRead(1, 'floor', read), cache.cachedRead(1, 'floor', read), cache.cachedRead(1, 'floor', read)]
    expect(calls).toHaveLength(1)
    calls[0]!.release()
    expect(await Promise.all(asked)).toEqual(['day 1', 'day 1', 'day 1'])
    expect(await cache.cachedRead(1, 'floor', read)).toBe('day 1')
    expect(calls).toHaveLength(1)
    cache.dropReads(1)
  })

  it('reads again once READ_CACHE_MS has passed', async () => {
    let n = 0
    const read = async () => `read ${++n}`
    expect(await cache.cachedRead(2, 'floor', read)).toBe('read 1')
    expect(await cache.cachedRead(2, 'floor', read)).toBe('read 1')
    await new Promise(r => setTimeout(r, TTL_MS + 20))
    expect(await cache.cachedRead(2, 'floor', read)).toBe('read 2')
  })

  it('keeps workshops and keys apart', async () => {
    expect(await cache.cachedRead(3, 'floor', async () => 'workshop 3')).toBe('workshop 3')
    expect(await cache.cachedRead(4, 'floor', async () => 'workshop 4')).toBe('workshop 4')
    expect(await cache.cachedRead(3, 'other', async () => 'other key')).toBe('other key')
    expect(await cache.cachedRead(3, 'floor', async () => 'not asked')).toBe('workshop 3')
  })

  it('reads again after a drop of the workshop, and leaves the other workshops\' answers', async () => {
    expect(await cache.cachedRead(5, 'floor', async () => 'before')).toBe('before')
    expect(await cache.cachedRead(6, 'floor', async () => 'six')).toBe('six')
    cache.dropReads(5)
    expect(await cache.cachedRead(5, 'floor', async () => 'after')).toBe('after')
    expect(await cache.cachedRead(6, 'floor', async () => 'not asked')).toBe('six')
    cache.dropReads()
    expect(await cache.cachedRead(6, 'floor', async () => 'after all')).toBe('after all')
  })

  it('gives a read under way at a drop only to those who asked before it; who asks after gets a new read', async () => {
    let state = 'planned'
    const { read, calls } = counted(() => state)
    const before = cache.cachedRead(7, 'floor', read)
    state = 'mixing' // committed while the read was under way; its answer may be the old state
    cache.dropReads(7)
    const after = cache.cachedRead(7, 'floor', read)
    expect(calls).toHaveLength(2)
    calls[0]!.release()
    calls[1]!.release()
    expect(await after).toBe('mixing')
    await before
    await settle()
    expect(await cache.cachedRead(7, 'floor', read)).toBe('mixing')
    expect(calls).toHaveLength(2)
  })

  it('does not keep a failed read', async () => {
    await expect(cache.cachedRead(8, 'floor', () => Promise.reject(new Error('database gone')))).rejects.toThrow('database gone')
    await settle()
    expect(await cache.cachedRead(8, 'floor', async () => 'back')).toBe('back')
  })

  it('past SWEEP_ABOVE keys, a new answer takes out the workshop\'s expired ones and keeps the fresh ones', async () => {
    for (let i = 0; i < cache.SWEEP_ABOVE + 6; i++) await cache.cachedRead(9, `progress:${i}`, async () => i)
    expect(cache.keptCount(9)).toBe(cache.SWEEP_ABOVE + 6)
    await new Promise(r => setTimeout(r, TTL_MS + 20))
    expect(await cache.cachedRead(9, 'progress:new', async () => 'new')).toBe('new')
    expect(cache.keptCount(9)).toBe(1)
    for (let i = 0; i < cache.SWEEP_ABOVE; i++) await cache.cachedRead(9, `fresh:${i}`, async () => i)
    expect(cache.keptCount(9)).toBe(cache.SWEEP_ABOVE + 1)
    expect(await cache.cachedRead(9, 'progress:new', async () => 'not asked')).toBe('new')
    cache.dropReads(9)
  })

  it('names the workshop of a workshop room, and no other room', () => {
    expect(cache.workshopOfRoom('workshop:12')).toBe(12)
    for (const room of ['job:12', 'user:12', 'session:3', 'tablet:4', 'workshop:', 'workshop:1x']) expect(cache.workshopOfRoom(room)).toBeUndefined()
  })
})
