// socket.io on the Nitro server (server/plugins/socket.io.ts) and the emit helpers that
// services call after their transaction commits.
import type { Server } from 'socket.io'
import type { LiveEvent } from '#shared/types/live'
import { liveRooms } from '#shared/types/live'
import { dropReads } from './read-cache'
import { noteLiveEvent } from './live-since'

/** The server-side message that tells the other instances a workshop's data changed (server/utils/read-cache.ts). */
export const READS_CHANGED = 'setline:reads-changed'

let io: Server | undefined

export function setRealtimeServer(server: Server | undefined) {
  io = server
}

export function realtimeServer() {
  return io
}

/** Sends an event to everyone of a workshop (staff rooms; clients join job rooms only). */
export function emitToWorkshop(workshopId: number, event: LiveEvent) {
  // before the event goes out: a page that reads again on it must not get the answer from before
  dropReads(workshopId)
  noteLiveEvent([liveRooms.workshop(workshopId)])
  io?.to(liveRooms.workshop(workshopId)).emit('live', event)
}

/** Sends an event to a job's room: its client members and the workshop's staff. */
export function emitToJob(workshopId: number, jobId: number, event: LiveEvent) {
  dropReads(workshopId)
  noteLiveEvent([liveRooms.job(jobId), liveRooms.workshop(workshopId)])
  io?.to(liveRooms.job(jobId)).to(liveRooms.workshop(workshopId)).emit('live', event)
}

// Rights taken away reach live sockets at once, on every app instance: the postgres adapter
// passes disconnectSockets and socketsLeave to the other servers like an emit (socket.io
// "Server instance: utility methods", which work with an adapter that supports them).

/** Drops every live socket of a person (disabled, another role, a new password). */
export function disconnectUser(userId: number) {
  io?.in(liveRooms.user(userId)).disconnectSockets(true)
}

/** Drops the sockets opened with one session (signed out, or its tablet revoked). */
export function disconnectSession(sessionId: number) {
  io?.in(liveRooms.session(sessionId)).disconnectSockets(true)
}

/** A client taken off a job stops hearing its room at once; their other jobs stay. */
export function leaveJob(userId: number, jobId: number) {
  io?.in(liveRooms.user(userId)).socketsLeave(liveRooms.job(jobId))
}

/**
 * A write of a workshop (undefined: of no known workshop) ended: its kept answers go here and on
 * the other instances, where no live event may follow (a lot received, a mould edited).
 */
export function readsChanged(workshopId: number | undefined) {
  dropReads(workshopId)
  io?.serverSideEmit(READS_CHANGED, workshopId ?? null)
}
