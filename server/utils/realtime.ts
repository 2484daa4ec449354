// socket.io on the Nitro server (server/plugins/socket.io.ts) and the emit helpers that
// services call after their transaction commits.
import type { Server } from 'socket.io'
import type { LiveEvent } from '#shared/types/live'
import { liveRooms } from '#shared/types/live'

let io: Server | undefined

export function setRealtimeServer(server: Server | undefined) {
  io = server
}

export function realtimeServer() {
  return io
}

/** Sends an event to everyone of a workshop (staff rooms; clients join job rooms only). */
export function emitToWorkshop(workshopId: number, event: LiveEvent) {
  io?.to(liveRooms.workshop(workshopId)).emit('live', event)
}

/** Sends an event to a job's room: its client members and the workshop's staff. */
export function emitToJob(workshopId: number, jobId: number, event: LiveEvent) {
  io?.to(liveRooms.job(jobId)).to(liveRooms.workshop(workshopId)).emit('live', event)
}
