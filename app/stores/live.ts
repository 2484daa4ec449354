// The live connection: one socket.io client per tab, its status for the header indicator,
// and the listeners pages register. On reconnect every listener's catch-up runs, so a page
// refetches what it shows after a Wi-Fi drop.
// socket.io's client is imported when the first connection opens, so it rides in a chunk of its
// own instead of the entry every page waits for (app/plugins/live.client.ts opens it once the
// page is interactive).
// A connection the server refused (its session check failed: the database busy or restarting,
// or the session ended) is not retried by socket.io's client on its own (socket.io "Client
// API", event connect_error: after a middleware error `socket.active` is false and the socket
// must be connected again by hand). While someone is signed in, it is tried again after
// RETRY_MS, doubling up to RETRY_MAX_MS; each new connection runs the pages' catch-up, so a
// tablet that was refused once does not stay deaf to the shop until it is reloaded. A socket
// the server ended (`io server disconnect`: signed out, rights taken away) stays closed.
// The first connection names when the page's data was read (`since`, server/utils/live-since.ts);
// the server's answer says whether an event went out before the socket joined its rooms, and if
// so the pages catch up then too.
// A page opened by a link (no new connection) reads its data in its setup and listens once it is
// mounted; an event that came in between was handed only to the page it replaced. So the store
// keeps the last events it heard for a while, numbered: a page takes a mark before it reads
// (`mark`), and its listener gets the events heard after the mark when it registers.
import { defineStore } from 'pinia'
import type { Socket } from 'socket.io-client'
import { LIVE_SINCE, type LiveEvent, type LiveHandshake, type LiveSinceAnswer } from '#shared/types/live'

export type LiveStatus = 'off' | 'connecting' | 'online' | 'offline'
/** First wait before a refused connection is tried again, and the longest wait. */
export const RETRY_MS = 2_000
export const RETRY_MAX_MS = 60_000

interface Listener { match: (e: LiveEvent) => boolean; onEvent: (e: LiveEvent) => void; onCatchUp?: () => void }
/** How many of the last events, heard within how long, a newly mounted page is handed. */
export const RECENT_EVENTS = 50
export const RECENT_MS = 60_000

export const useLiveStore = defineStore('live', () => {
  const status = ref<LiveStatus>('off')
  const listeners = new Set<Listener>()
  /** the last events heard, numbered in order */
  const recent: { n: number; at: number; e: LiveEvent }[] = []
  let heard = 0
  let socket: Socket | undefined
  let everConnected = false
  /** the first connection is open and the server's word on missed events is still to come */
  let firstAnswerDue = false
  /** bumped by disconnect, so a connect still loading the client does not open a socket after it */
  let generation = 0
  let opening = false
  let retry: ReturnType<typeof setTimeout> | undefined
  let retryMs = RETRY_MS

  /** `since`: when the page's data was read, the server's clock (ms); unknown counts as long ago. */
  async function connect(since?: number) {
    if (socket || opening) return
    opening = true
    status.value = 'connecting'
    const mine = generation
    let io: typeof import('socket.io-client').io
    try {
      ({ io } = await import('socket.io-client'))
    }
    catch {
      // the chunk did not load (the network dropped): offline until the next sign-in or reload
      if (mine === generation) status.value = 'offline'
      return
    }
    finally {
      opening = false
    }
    if (mine !== generation || socket) return
    const auth: LiveHandshake = since === undefined ? {} : { since }
    const s = io({ path: '/socket.io/', transports: ['websocket', 'polling'], withCredentials: true, auth })
    socket = s
    const catchUp = () => listeners.forEach(l => l.onCatchUp?.())
    s.on('connect', () => {
      status.value = 'online'
      retryMs = RETRY_MS
      if (everConnected) catchUp()
      else firstAnswerDue = true
      everConnected = true
    })
    s.on(LIVE_SINCE, (answer: LiveSinceAnswer) => {
      if (firstAnswerDue && answer.missed) catchUp()
      firstAnswerDue = false
    })
    s.on('disconnect', () => {
      status.value = 'offline'
    })
    s.on('connect_error', () => {
      status.value = 'offline'
      // a network error is retried by the client itself; a refusal is not (see above)
      if (s.active || retry) return
      retry = setTimeout(() => {
        retry = undefined
        if (socket === s && !s.connected) s.connect()
      }, retryMs)
      retryMs = Math.min(retryMs * 2, RETRY_MAX_MS)
      // a refused connection may come back with a missed change: catch up on the next connect
      everConnected = true
    })
    s.on('live', (e: LiveEvent) => {
      recent.push({ n: ++heard, at: Date.now(), e })
      if (recent.length > RECENT_EVENTS) recent.shift()
      listeners.forEach(l => l.match(e) && l.onEvent(e))
    })
  }

  function disconnect() {
    generation++
    clearTimeout(retry)
    retry = undefined
    retryMs = RETRY_MS
    socket?.disconnect()
    socket = undefined
    everConnected = false
    firstAnswerDue = false
    // what the last person's socket heard is no one else's (the numbering goes on, so marks hold)
    recent.length = 0
    status.value = 'off'
  }

  /** A mark to take before a page reads its data, for `listen`. */
  function mark() {
    return heard
  }

  /** Registers a page's listener; events heard since `since` (a mark) are handed to it at once. */
  function listen(l: Listener, since?: number) {
    listeners.add(l)
    if (since !== undefined) {
      const after = Date.now() - RECENT_MS
      for (const r of recent) if (r.n > since && r.at >= after && l.match(r.e)) l.onEvent(r.e)
    }
    return () => listeners.delete(l)
  }

  return { status, connect, disconnect, mark, listen }
})
