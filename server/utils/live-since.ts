// Whether a page may have missed a live event before its socket opened. A page is read first
// (the server renders it, or the tablet reads its day) and its socket opens only once the page
// is interactive, up to a few seconds later on a slow tablet; an event sent in between went to
// rooms the page was not in yet. So the page's first connection says when its data was read
// (LiveHandshake.since: the start of the request that rendered the document, server clock) and
// the server answers whether any of the socket's rooms heard an event at or after it; if one did,
// the page reads again (app/stores/live.ts), as it does after a reconnect.
//
// Each instance notes the time of every event sent to a room, its own (server/utils/realtime.ts)
// and the other instances' (the adapter's broadcasts, server/plugins/socket.io.ts), in memory.
// What it cannot vouch for counts as missed, which costs the page one read:
// - a read from before this process started (it heard nothing then);
// - a read older than KEEP_MS, once rooms quiet for longer have been forgotten;
// - a connection that names no time.
// SKEW_MS allows for the clocks of two instances on different machines.

/** How long a room's last event is remembered once the map holds more than SWEEP_ABOVE rooms. */
export const KEEP_MS = 10 * 60_000
const SWEEP_ABOVE = 5_000
export const SKEW_MS = 250

const lastEventAt = new Map<string, number>()
/** Events before this time may have been forgotten (or were never heard). */
let vouchFrom = Date.now()

/** Notes that an event went to these rooms now. */
export function noteLiveEvent(rooms: Iterable<string>, at = Date.now()) {
  for (const room of rooms) lastEventAt.set(room, at)
  if (lastEventAt.size <= SWEEP_ABOVE) return
  const forget = at - KEEP_MS
  for (const [room, t] of lastEventAt) if (t < forget) lastEventAt.delete(room)
  vouchFrom = Math.max(vouchFrom, forget)
}

/** Whether a page read at `since` may have missed an event of these rooms. */
export function missedSince(rooms: Iterable<string>, since: unknown): boolean {
  if (typeof since !== 'number' || !Number.isFinite(since)) return true
  const from = since - SKEW_MS
  if (from < vouchFrom) return true
  for (const room of rooms) if ((lastEventAt.get(room) ?? -Infinity) >= from) return true
  return false
}
