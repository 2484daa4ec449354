// The live connection: one socket.io client per tab, its status for the header indicator,
// and the listeners pages register. On reconnect every listener's catch-up runs, so a page
// refetches what it shows after a Wi-Fi drop.
// socket.io's client is imported when the first connection opens, so it rides in a chunk of its
// own instead of the entry every page waits for (app/plugins/live.client.ts opens it once the
// page is interactive).
import { defineStore } from 'pinia'
import type { Socket } from 'socket.io-client'
import type { LiveEvent } from '#shared/types/live'

export type LiveStatus = 'off' | 'connecting' | 'online' | 'offline'
interface Listener { match: (e: LiveEvent) => boolean; onEvent: (e: LiveEvent) => void; onCatchUp?: () => void }

export const useLiveStore = defineStore('live', () => {
  const status = ref<LiveStatus>('off')
  const listeners = new Set<Listener>()
  let socket: Socket | undefined
  let everConnected = false
  /** bumped by disconnect, so a connect still loading the client does not open a socket after it */
  let generation = 0
  let opening = false

  async function connect() {
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
    socket = io({ path: '/socket.io/', transports: ['websocket', 'polling'], withCredentials: true })
    socket.on('connect', () => {
      status.value = 'online'
      if (everConnected) listeners.forEach(l => l.onCatchUp?.())
      everConnected = true
    })
    socket.on('disconnect', () => {
      status.value = 'offline'
    })
    socket.on('connect_error', () => {
      status.value = 'offline'
    })
    socket.on('live', (e: LiveEvent) => listeners.forEach(l => l.match(e) && l.onEvent(e)))
  }

  function disconnect() {
    generation++
    socket?.disconnect()
    socket = undefined
    everConnected = false
    status.value = 'off'
  }

  function listen(l: Listener) {
    listeners.add(l)
    return () => listeners.delete(l)
  }

  return { status, connect, disconnect, listen }
})
