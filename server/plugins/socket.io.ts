// socket.io on the same server and port as the app, in development and production: an
// engine.io server bound through Nitro's websocket support (the socket.io guide for
// Nuxt; it uses private fields of crossws 0.3.x, held still by our pins and covered by a
// websocket-only test). Connections authenticate from the session cookie; staff join
// their workshop's room, clients the rooms of their jobs. With several app instances,
// @socket.io/postgres-adapter passes events between them through PostgreSQL.
import { Server as Engine } from 'engine.io'
import { Server, type Socket } from 'socket.io'
import { createAdapter } from '@socket.io/postgres-adapter'
import pg from 'pg'
import { parse as parseCookies } from 'cookie-es'
import { LIVE_SINCE, liveRooms, type LiveHandshake, type LiveSinceAnswer } from '#shared/types/live'
import { TABLET_COOKIE } from '#shared/utils/tablet-schemas'
import { jobsRepo } from '../repos/jobs'
import { dropReads, workshopOfRoom } from '../utils/read-cache'
import { READS_CHANGED } from '../utils/realtime'
import { missedSince, noteLiveEvent } from '../utils/live-since'

async function authenticate(socket: Socket) {
  const cookies = parseCookies(socket.request.headers.cookie ?? '')
  try {
    const data = await unsealedCookie(cookies[sessionCookieName()])
    const user = data.user
    // the same checks as requireRole: a live server-side record, an enabled user, the same session version
    const row = await liveSessionUser(data)
    if (!user || !row) return undefined
    // a PIN session on a shared tablet, as requireRole checks it (server/utils/tablet.ts)
    if (user.tablet && !(await tabletOfSession(user, cookies[TABLET_COOKIE]))) return undefined
    return { ...row, tabletId: user.tablet?.id }
  }
  catch {
    return undefined
  }
}

async function joinRooms(socket: Socket, user: { id: number; workshop_id: number; role: string; session_id: number; tabletId?: number }) {
  // a person's and a session's own rooms: taking rights away drops or narrows these sockets
  // at once (server/utils/realtime.ts disconnectUser, disconnectSession, leaveJob)
  await socket.join([liveRooms.user(user.id), liveRooms.session(user.session_id)])
  if (user.tabletId) await socket.join(liveRooms.tablet(user.tabletId))
  if (user.role !== 'client') {
    await socket.join(liveRooms.workshop(user.workshop_id))
    return
  }
  const jobs = await jobsRepo.memberJobIds(useDb(), user.workshop_id, user.id)
  await socket.join(jobs.map(id => liveRooms.job(id)))
}

/** Longest delay setTimeout takes (2^31 - 1 ms); a session ends sooner than that anyway. */
const MAX_TIMER_MS = 2_147_483_647

/**
 * The adapter's pool: a lost connection (PostgreSQL restarted or unreachable) emits 'error'
 * on its pg client, and an 'error' event nobody listens to is thrown by Node and ends the
 * process (Node.js "Error events"; node-postgres "Pool: events", error). The pool listens
 * on idle clients only, so each client gets a listener too, including the one the adapter
 * holds checked out for LISTEN. The adapter never releases that one when it dies, so it
 * would keep its place in the pool for good and, after a restart or two, leave none for
 * publishing: a checked-out client that fails and is still held is released as broken
 * (`release(err)` removes it). The adapter then takes a new client (it retries every ~2 s) and live updates resume
 * once the database is back.
 */
function adapterPool() {
  const pool = new pg.Pool({ connectionString: appEnv().DATABASE_URL, max: 2 })
  const checkedOut = new Set<pg.PoolClient>()
  pool.on('acquire', client => checkedOut.add(client))
  pool.on('release', (_err, client) => checkedOut.delete(client))
  pool.on('remove', client => checkedOut.delete(client as pg.PoolClient))
  pool.on('error', err => useLogger().error({ err: { message: err.message } }, 'socket.io adapter: database connection lost'))
  pool.on('connect', client => client.on('error', (err) => {
    useLogger().error({ err: { message: err.message } }, 'socket.io adapter: database connection lost')
    // after pool.query's own handlers ran: a client it holds is released by it (a second
    // release throws), so what is still checked out then is the adapter's
    const held = client as pg.PoolClient
    setImmediate(() => {
      if (checkedOut.delete(held)) held.release(err)
    })
  }))
  return pool
}

/** The cluster adapter's message types this instance acts on (socket.io-adapter's ClusterAdapter, MessageType). */
const BROADCAST = 3

/**
 * Kept answers (server/utils/read-cache.ts) follow what the other instances do: an event
 * broadcast by another instance drops its workshop's answers here before this instance hands
 * it to its sockets (the adapter's onMessage, wrapped: one message, in order, so a tablet that
 * reads again on the event reads after the drop), and a write elsewhere drops them on its
 * READS_CHANGED message. The event's rooms are noted too, for pages that connect after it
 * (server/utils/live-since.ts).
 */
function dropReadsAhead(io: Server) {
  const adapter = io.of('/').adapter as unknown as { onMessage: (message: { type: number; data?: { opts?: { rooms?: string[] } } }, offset?: string) => unknown }
  const deliver = adapter.onMessage.bind(adapter)
  adapter.onMessage = (message, offset) => {
    if (message.type === BROADCAST) {
      noteLiveEvent(message.data?.opts?.rooms ?? [])
      for (const room of message.data?.opts?.rooms ?? []) {
        const workshopId = workshopOfRoom(room)
        if (workshopId !== undefined) dropReads(workshopId)
      }
    }
    return deliver(message, offset)
  }
  io.on(READS_CHANGED, (workshopId: number | null) => dropReads(workshopId ?? undefined))
}

export default defineNitroPlugin((nitroApp) => {
  // allowRequest covers the polling transport; the websocket upgrade reaches engine.io
  // without it (engine.onWebSocket below), so the io.use check is the one that holds for both
  const engine = new Engine({
    pingInterval: 10_000, pingTimeout: 8_000,
    allowRequest: (req, callback) => {
      const foreign = isForeignRequest(req.headers)
      callback(foreign ? 'This connection does not come from a Setline page' : null, !foreign)
    },
  })
  const io = new Server({ serveClient: false })
  const pool = adapterPool()
  io.adapter(createAdapter(pool, { errorHandler: err => useLogger().error({ err: { message: err.message } }, 'socket.io adapter') }))
  dropReadsAhead(io)
  io.bind(engine)
  io.use(async (socket, next) => {
    // a page of another site must not open a live connection with the user's cookie
    // (cross-site WebSocket hijacking: OWASP WebSocket Security Cheat Sheet, "Origin validation")
    if (isForeignRequest(socket.request.headers)) return next(new Error('This connection does not come from a Setline page'))
    const user = await authenticate(socket)
    if (!user) return next(new Error('Please sign in'))
    socket.data.userId = user.id
    socket.data.workshopId = user.workshop_id
    socket.data.sessionId = user.session_id
    await joinRooms(socket, user)
    // the socket ends with its session, as the cookie does on the next request
    const ends = setTimeout(() => socket.disconnect(true), Math.min(MAX_TIMER_MS, Math.max(0, user.session_expires_at.getTime() - Date.now())))
    socket.once('disconnect', () => clearTimeout(ends))
    next()
  })
  // whether the page may have missed an event before this socket joined its rooms (server/utils/live-since.ts)
  io.on('connection', (socket) => {
    const answer: LiveSinceAnswer = { missed: missedSince(socket.rooms, (socket.handshake.auth as LiveHandshake).since) }
    socket.emit(LIVE_SINCE, answer)
  })
  setRealtimeServer(io)

  nitroApp.router.use('/socket.io/', defineEventHandler({
    handler(event) {
      engine.handleRequest(event.node.req as never, event.node.res)
      event._handled = true
    },
    websocket: {
      open(peer) {
        const internal = (peer as unknown as { _internal: { nodeReq: { socket: unknown } } })._internal
        // @ts-expect-error private method of engine.io, as in the socket.io guide for Nuxt
        engine.prepare(internal.nodeReq)
        // @ts-expect-error private method of engine.io, as in the socket.io guide for Nuxt
        engine.onWebSocket(internal.nodeReq, internal.nodeReq.socket, (peer as unknown as { websocket: unknown }).websocket)
      },
    },
  }))

  nitroApp.hooks.hook('close', async () => {
    setRealtimeServer(undefined)
    io.close()
    await pool.end()
  })
})
