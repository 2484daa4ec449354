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
import { liveRooms } from '#shared/types/live'
import type { SessionUserData } from '#shared/types/auth'
import { TABLET_COOKIE } from '#shared/utils/tablet-schemas'
import { usersRepo } from '../repos/users'

async function authenticate(socket: Socket) {
  const name = (useRuntimeConfig().session as { name?: string }).name ?? 'nuxt-session'
  const cookies = parseCookies(socket.request.headers.cookie ?? '')
  const sealed = cookies[name]
  if (!sealed) return undefined
  const password = process.env.NUXT_SESSION_PASSWORD ?? ''
  try {
    const session = await unsealSession(undefined as never, { password, maxAge: 60 * 60 * 12 }, sealed)
    const user = (session.data as { user?: SessionUserData }).user
    if (!user) return undefined
    const row = await usersRepo.byId(useDb(), user.workshopId, user.id)
    if (!row || row.disabled_at || row.session_version !== user.sv) return undefined
    // a PIN session on a shared tablet, as requireRole checks it (server/utils/tablet.ts)
    if (user.tablet && !(await tabletOfSession(user, cookies[TABLET_COOKIE]))) return undefined
    return { ...row, tabletId: user.tablet?.id }
  }
  catch {
    return undefined
  }
}

async function joinRooms(socket: Socket, user: { id: number; workshop_id: number; role: string; tabletId?: number }) {
  if (user.tabletId) await socket.join(liveRooms.tablet(user.tabletId))
  if (user.role !== 'client') {
    await socket.join(liveRooms.workshop(user.workshop_id))
    return
  }
  const jobs = await useDb()('job_members').where({ workshop_id: user.workshop_id, user_id: user.id }).pluck('job_id')
  await socket.join(jobs.map(id => liveRooms.job(Number(id))))
}

export default defineNitroPlugin((nitroApp) => {
  const engine = new Engine({ pingInterval: 10_000, pingTimeout: 8_000 })
  const io = new Server({ serveClient: false })
  const pool = new pg.Pool({ connectionString: appEnv().DATABASE_URL, max: 2 })
  io.adapter(createAdapter(pool, { errorHandler: err => console.error('socket.io adapter:', err.message) }))
  io.bind(engine)
  io.use(async (socket, next) => {
    const user = await authenticate(socket)
    if (!user) return next(new Error('Please sign in'))
    socket.data.userId = user.id
    socket.data.workshopId = user.workshop_id
    await joinRooms(socket, user)
    next()
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
