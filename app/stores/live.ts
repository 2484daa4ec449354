// The live connection: one socket.io client per tab, its status for the header indicator,
// and the listeners pages register. On reconnect every listener's catch-up runs, so a page
// refetches what it shows after a Wi-Fi drop.
import { defineStore } from 'pinia'
import { io, type Socket } from 'socket.io-client'
import type { LiveEvent } from '#shared/types/live'

export type LiveStatus = 'off' | 'connecting' | 'online' | 'offline'
interface Listener { match: (e: LiveEvent) => boolean; onEvent: (e: LiveEvent) => void; onCatchUp?: () => void }

export const useLiveStore = defineStore('live', () => {
  const status = ref<LiveStatus>('off')
  const listeners = new Set<Listener>()
  let socket: Socket | undefined
  let everConnected = false

  function connect() {
    if (socket) return
    status.value = 'connecting'
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
