// The live connection's store with socket.io's client replaced by a fake socket: a connection
// the server refused is tried again (socket.io's client does not retry a middleware refusal
// itself), with a growing wait, and the pages catch up once it connects; a connection lost on
// the network is left to the client's own reconnection; signing out stops the retries. The
// first connection names when the page was read, and the pages catch up when the server says
// an event went out before the socket joined its rooms. A page mounted after an event it did not
// read is handed the event when it listens.
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest'
import { createPinia, setActivePinia } from 'pinia'
import { RECENT_MS, RETRY_MAX_MS, RETRY_MS, useLiveStore } from '../../app/stores/live'
import { LIVE_SINCE } from '#shared/types/live'

class FakeSocket {
  handlers = new Map<string, ((...a: unknown[]) => void)[]>()
  active = true
  connected = false
  connects = 0
  constructor(readonly opts: { auth?: { since?: number } }) {}
  on(name: string, fn: (...a: unknown[]) => void) {
    this.handlers.set(name, [...(this.handlers.get(name) ?? []), fn])
    return this
  }

  fire(name: string, ...a: unknown[]) {
    for (const fn of this.handlers.get(name) ?? []) fn(...a)
  }

  connect() {
    this.connects++
    this.active = true
    return this
  }

  disconnect() {
    this.active = false
    this.connected = false
    return this
  }

  /** The server's middleware said no: socket.io's client then stops (active false). */
  refused() {
    this.active = false
    this.connected = false
    this.fire('connect_error', new Error('Please sign in'))
  }

  /** A network error: the client keeps trying on its own (active stays true). */
  networkError() {
    this.fire('connect_error', new Error('xhr poll error'))
  }

  opened() {
    this.connected = true
    this.fire('connect')
  }
}

const sockets: FakeSocket[] = []
vi.mock('socket.io-client', () => ({
  io: (opts: { auth?: { since?: number } }) => {
    const s = new FakeSocket(opts)
    sockets.push(s)
    return s
  },
}))

describe('live store', () => {
  beforeEach(() => {
    setActivePinia(createPinia())
    sockets.length = 0
    vi.useFakeTimers({ toFake: ['setTimeout', 'clearTimeout'] })
  })
  afterEach(() => {
    vi.useRealTimers()
  })

  it('tries a refused connection again after a growing wait, and the pages catch up when it opens', async () => {
    const live = useLiveStore()
    const catchUp = vi.fn()
    live.listen({ match: () => true, onEvent: () => {}, onCatchUp: catchUp })
    await live.connect()
    const s = sockets[0]!
    s.refused()
    expect(live.status).toBe('offline')
    vi.advanceTimersByTime(RETRY_MS - 1)
    expect(s.connects).toBe(0)
    vi.advanceTimersByTime(1)
    expect(s.connects).toBe(1)
    // refused again: the next wait is twice as long
    s.refused()
    vi.advanceTimersByTime(RETRY_MS * 2 - 1)
    expect(s.connects).toBe(1)
    vi.advanceTimersByTime(1)
    expect(s.connects).toBe(2)
    s.opened()
    expect(live.status).toBe('online')
    // changes made while it was refused were missed: the pages read again
    expect(catchUp).toHaveBeenCalledTimes(1)
    // the wait starts over after a connection that opened
    s.refused()
    vi.advanceTimersByTime(RETRY_MS)
    expect(s.connects).toBe(3)
  })

  it('never waits longer than the cap', async () => {
    const live = useLiveStore()
    await live.connect()
    const s = sockets[0]!
    for (let i = 0; i < 8; i++) {
      s.refused()
      vi.advanceTimersByTime(RETRY_MAX_MS)
      expect(s.connects).toBe(i + 1)
    }
  })

  it('leaves a network error to the client\'s own reconnection', async () => {
    const live = useLiveStore()
    await live.connect()
    const s = sockets[0]!
    s.networkError()
    expect(live.status).toBe('offline')
    vi.advanceTimersByTime(RETRY_MAX_MS)
    expect(s.connects).toBe(0)
  })

  it('stops trying once signed out', async () => {
    const live = useLiveStore()
    await live.connect()
    const s = sockets[0]!
    s.refused()
    live.disconnect()
    vi.advanceTimersByTime(RETRY_MAX_MS)
    expect(s.connects).toBe(0)
    expect(live.status).toBe('off')
  })

  it('names when the page was read, and catches up on a first connection only when the server says it missed an event', async () => {
    const live = useLiveStore()
    const catchUp = vi.fn()
    live.listen({ match: () => true, onEvent: () => {}, onCatchUp: catchUp })
    await live.connect(1_764_000_000_000)
    const s = sockets[0]!
    expect(s.opts.auth).toEqual({ since: 1_764_000_000_000 })
    s.opened()
    s.fire(LIVE_SINCE, { missed: false })
    expect(catchUp).not.toHaveBeenCalled()
    // a reconnect catches up whatever the server says, and the answer that follows adds nothing
    s.fire('disconnect')
    s.opened()
    s.fire(LIVE_SINCE, { missed: true })
    expect(catchUp).toHaveBeenCalledTimes(1)

    // signed out and in again: a new first connection, which missed an event
    live.disconnect()
    await live.connect()
    const again = sockets[1]!
    expect(again.opts.auth).toEqual({})
    again.opened()
    expect(catchUp).toHaveBeenCalledTimes(1)
    again.fire(LIVE_SINCE, { missed: true })
    expect(catchUp).toHaveBeenCalledTimes(2)
  })

  it('hands a page that mounts the events heard since it took its mark, before it read', async () => {
    vi.useFakeTimers({ toFake: ['setTimeout', 'clearTimeout', 'Date'] })
    const live = useLiveStore()
    const old = vi.fn()
    live.listen({ match: () => true, onEvent: old })
    await live.connect()
    const s = sockets[0]!
    s.opened()
    const ev = (id: number, type = 'pour.updated') => ({ type, id, version: 1, row: {} })
    s.fire('live', ev(1))
    // the new page takes its mark and reads; meanwhile two events come, one of a kind it ignores
    const mark = live.mark()
    s.fire('live', ev(2))
    s.fire('live', ev(3, 'photo.created'))
    expect(old).toHaveBeenCalledTimes(3)
    const got = vi.fn()
    live.listen({ match: e => e.type === 'pour.updated', onEvent: got }, mark)
    expect(got.mock.calls.map(c => c[0].id)).toEqual([2])
    // a listener with no mark is handed nothing from before
    const plain = vi.fn()
    live.listen({ match: () => true, onEvent: plain })
    expect(plain).not.toHaveBeenCalled()
    // events heard longer ago than RECENT_MS are not handed on
    const later = live.mark()
    s.fire('live', ev(4))
    vi.advanceTimersByTime(RECENT_MS + 1)
    const late = vi.fn()
    live.listen({ match: () => true, onEvent: late }, later)
    expect(late).not.toHaveBeenCalled()
    // signed out: what the socket heard goes with it
    const beforeOut = live.mark()
    s.fire('live', ev(5))
    live.disconnect()
    const next = vi.fn()
    live.listen({ match: () => true, onEvent: next }, beforeOut)
    expect(next).not.toHaveBeenCalled()
  })
})
