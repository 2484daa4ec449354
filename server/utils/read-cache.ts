// Answers of the busiest reads kept for a moment in this process: every tablet reads its day
// again on every live event, so one change in a shop of eight tablets is eight identical reads
// within a few milliseconds. One read is made and shared (the first reader's promise), and it is
// kept for READ_CACHE_MS at most (1 s by default; 0 turns the cache off).
//
// An answer is dropped the moment something it was read from may have changed, so nobody reads
// an answer older than the change they were told about:
// - a live event of a workshop (server/utils/realtime.ts) drops the workshop's answers here
//   before the event goes out, and on the other instances before they hand it to their sockets
//   (server/plugins/socket.io.ts watches the adapter's messages); a tablet that reads again on
//   the event therefore never gets the answer from before it;
// - a write request (any method but GET and HEAD) drops its workshop's answers as it answers,
//   here at once and on the other instances through the adapter (server/plugins/read-cache.ts):
//   a lot received or a mould edited sends no event, but the next read sees it;
// - a read that was under way when its workshop's answers were dropped is not kept.
// Answers older than READ_CACHE_MS are replaced when next asked for. A key per job (a client's
// progress) would otherwise pile up in a workshop that changes seldom: past SWEEP_ABOVE keys, a
// new answer first takes out the workshop's answers that are past their time.
// Every answer is scoped by its workshop in the key, like the rows it comes from.
import { appEnv } from './env'

/** Keys of one workshop beyond which a new answer sweeps out the expired ones. */
export const SWEEP_ABOVE = 64

type Answers = Map<string, { at: number; value: Promise<unknown> }>

/** Each workshop's answers by key. */
const workshops = new Map<number, Answers>()

function answersOf(workshopId: number): Answers {
  let w = workshops.get(workshopId)
  if (!w) {
    w = new Map()
    workshops.set(workshopId, w)
  }
  return w
}

let ttl: number | undefined
function ttlMs() {
  ttl ??= appEnv().READ_CACHE_MS
  return ttl
}

/**
 * The answer of `read` for this workshop and key: the one made less than READ_CACHE_MS ago
 * when nothing of the workshop changed since, else a new one (shared by everyone who asks
 * while it is being made). A failed read is not kept.
 */
export function cachedRead<T>(workshopId: number, key: string, read: () => Promise<T>): Promise<T> {
  const keep = ttlMs()
  if (keep <= 0) return read()
  const answers = answersOf(workshopId)
  const now = Date.now()
  const hit = answers.get(key)
  if (hit && now - hit.at < keep) return hit.value as Promise<T>
  if (answers.size >= SWEEP_ABOVE) {
    for (const [k, e] of answers) if (now - e.at >= keep) answers.delete(k)
  }
  const value = read()
  const entry = { at: now, value }
  // a drop while it is being read takes it out of the map: it may hold the state before the
  // change, so only those who asked before the drop get it
  answers.set(key, entry)
  value.catch(() => answers.get(key) === entry && answers.delete(key))
  return value
}

/** How many answers a workshop holds (expired ones included), for the tests. */
export function keptCount(workshopId: number) {
  return workshops.get(workshopId)?.size ?? 0
}

/** Drops a workshop's answers (undefined: every workshop's). */
export function dropReads(workshopId?: number) {
  if (workshopId === undefined) workshops.clear()
  else workshops.delete(workshopId)
}

/** The workshop a live room belongs to (`workshop:N`), for drops on the other instances. */
export function workshopOfRoom(room: string): number | undefined {
  const m = /^workshop:(\d+)$/.exec(room)
  return m ? Number(m[1]) : undefined
}
