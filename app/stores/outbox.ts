// The tablets' offline outbox: every floor (pour) and finishing (piece) action gets its UUID
// on the tablet and is kept in IndexedDB (through idb) until the server has answered it. Sent
// in order when online, again after a drop (the browser's 'online' event, the socket's
// reconnect, a slow retry timer). The server answers a replay of an id with its first answer,
// so sending twice is harmless: each action runs exactly once. A refusal (409, 422)
// stays in the history, shown. Each entry records who tapped it and goes out only under that
// person's session (the rules: app/utils/outbox-owners.ts); a 401 stops sending until a sign-in.
// Photos taken on the floor are entries too: their files wait here (IndexedDB keeps File
// objects as they are: W3C Indexed Database API 3.0, values are structured-cloned) and go as
// one multipart upload with progress (`uploading`); the entry's id is the upload's action id,
// so a retry after a lost answer stores the photos once. Once answered the files are dropped.
// `clearCache` forgets the pages' offline copies at sign-out; waiting entries stay for their owner.
import { defineStore } from 'pinia'
import { openDB, type IDBPDatabase } from 'idb'
import { outcomeOf, sendableBy, type OutboxOwner } from '~/utils/outbox-owners'
import { postPhotos } from '~/composables/usePhotoUpload'

export type OutboxStatus = 'pending' | 'done' | 'refused'

export interface OutboxEntry {
  id: string
  /** the action route to POST to, e.g. /api/pieces/12/actions (entries queued before it existed were pours: see urlOf) */
  url?: string
  /** the pour a floor action is about */
  pourId?: number
  /** the piece a finishing action is about */
  pieceId?: number
  /** the action's kind (a FloorActionKind or a FinishingActionKind) */
  kind: string
  label: string
  /** Who tapped it (the signed-in person then); entries queued before this was recorded have none. */
  owner?: OutboxOwner
  /** Set when a lead took an entry without an owner on as theirs, to send it under their name. */
  adoptedAt?: string
  body: Record<string, unknown>
  /** Photos to upload (multipart, `url` is the job's photo route); dropped once answered. */
  files?: File[]
  /** How many photos the entry carried (kept after the files are dropped). */
  fileCount?: number
  /** When the caster tapped it (device clock), ISO. */
  tappedAt: string
  status: OutboxStatus
  tries: number
  message?: string
  result?: unknown
  settledAt?: string
}

const DB_NAME = 'setline-floor'
/** An action sent more than a minute after the tap carries the tap's time (it is then back-dated). */
const LATE_AFTER_MS = 60_000
const RETRY_MS = 15_000
const HISTORY_KEEP = 40
/** How long a refusal stays on the page above the cards (it stays in the outbox history after). */
const REFUSAL_SHOWN_MS = 10 * 60_000

let dbp: Promise<IDBPDatabase> | undefined
function outboxDb() {
  dbp ??= openDB(DB_NAME, 1, {
    upgrade(db) {
      db.createObjectStore('outbox', { keyPath: 'id' })
      db.createObjectStore('cache')
    },
  })
  return dbp
}

/**
 * A version-4 UUID (RFC 9562 §5.4). crypto.randomUUID exists only in secure contexts; a shop
 * tablet may reach Setline over plain http on the workshop's network, getRandomValues works there.
 */
export function outboxUuid() {
  const b = crypto.getRandomValues(new Uint8Array(16))
  b[6] = (b[6]! & 0x0f) | 0x40
  b[8] = (b[8]! & 0x3f) | 0x80
  const h = [...b].map(x => x.toString(16).padStart(2, '0')).join('')
  return `${h.slice(0, 8)}-${h.slice(8, 12)}-${h.slice(12, 16)}-${h.slice(16, 20)}-${h.slice(20)}`
}

/** Where an entry goes: its url, or (an entry queued by an older floor page) its pour's action route. */
function urlOf(e: OutboxEntry) {
  return e.url ?? `/api/pours/${e.pourId}/actions`
}

const statusOf = (e: unknown) => (e as { response?: { status?: number } })?.response?.status

export const useOutboxStore = defineStore('outbox', () => {
  const { user } = useUserSession()
  const entries = ref<OutboxEntry[]>([])
  const sending = ref(false)
  /** The photo entry being uploaded now, with its progress in percent. */
  const uploading = ref<{ id: string; percent: number } | null>(null)
  /** The signed-in person, as an entry records them. */
  const me = computed<OutboxOwner | null>(() => (user.value ? { id: user.value.id, name: user.value.name } : null))
  /** Set when a send met a 401: the session is over, nothing is sent until someone signs in. */
  const sessionEnded = ref<OutboxOwner | null>(null)
  const settled = new Set<(e: OutboxEntry) => void>()
  let timer: ReturnType<typeof setInterval> | undefined
  let again = false
  // a sign-in (or a switch of person) is what a 401 waits for; a sign-out leaves no one to send for
  watch(user, () => {
    sessionEnded.value = null
    if (timer) void flush()
  })

  const pending = computed(() => entries.value.filter(e => e.status === 'pending'))
  /** The pending entries the signed-in person took: the only ones this session sends. */
  const mine = computed(() => sendableBy(entries.value, me.value))
  const history = computed(() => entries.value.filter(e => e.status !== 'pending').slice(-HISTORY_KEEP).reverse())
  /** The latest refusal of the last ten minutes among the entries a page cares about (pours on the floor, pieces in finishing). */
  const recentRefusal = (mine: (e: OutboxEntry) => boolean) =>
    history.value.find(e => mine(e) && e.status === 'refused' && Date.now() - Date.parse(e.settledAt ?? '') < REFUSAL_SHOWN_MS)

  async function save(e: OutboxEntry) {
    await (await outboxDb()).put('outbox', toRaw(e))
  }

  async function start() {
    if (timer || import.meta.server) return
    const all = (await (await outboxDb()).getAll('outbox')) as OutboxEntry[]
    entries.value = all.sort((a, b) => a.tappedAt.localeCompare(b.tappedAt))
    window.addEventListener('online', () => flush())
    timer = setInterval(() => mine.value.length && flush(), RETRY_MS)
    void flush()
  }

  async function enqueue(e: Omit<OutboxEntry, 'id' | 'tappedAt' | 'status' | 'tries' | 'owner'>) {
    if (!me.value) throw new Error('Sign in to record a step')
    const entry: OutboxEntry = { ...e, owner: me.value, id: outboxUuid(), tappedAt: new Date().toISOString(), status: 'pending', tries: 0 }
    entries.value.push(entry)
    await save(entry)
    void flush()
    return entry
  }

  function bodyOf(e: OutboxEntry) {
    const late = !e.body.at && Date.now() - Date.parse(e.tappedAt) > LATE_AFTER_MS
    return { ...e.body, actionId: e.id, kind: e.kind, ...(late ? { at: e.tappedAt } : {}) }
  }

  /** A photo entry as the multipart form of the photo route, its id as the upload's action id. */
  async function sendPhotos(e: OutboxEntry) {
    const form = new FormData()
    for (const f of e.files ?? []) form.append('files', f, f.name)
    for (const [k, v] of Object.entries(e.body)) if (v !== undefined && v !== null) form.append(k, String(v))
    form.append('actionId', e.id)
    uploading.value = { id: e.id, percent: 0 }
    try {
      return await postPhotos(urlOf(e), form, (percent) => {
        uploading.value = { id: e.id, percent }
      })
    }
    finally {
      uploading.value = null
    }
  }

  async function settle(e: OutboxEntry, status: OutboxStatus, patch: Partial<OutboxEntry>) {
    // an answered photo entry needs its files no longer: the tablet's storage is not a photo store
    Object.assign(e, patch, { status, settledAt: new Date().toISOString() }, e.files ? { files: undefined } : {})
    // the pages take the answer in the same tick as the entry leaves "pending": notified after
    // the save, a card showed the server's old state for a moment, and an action form open on it
    // turned back into the previous step's form (a tap then sent that step again)
    settled.forEach(fn => fn(e))
    await save(e)
  }

  /**
   * Sends the signed-in person's pending actions one by one, in the order they were tapped;
   * stops at the first network failure, and at a 401 until someone signs in. Others' entries
   * wait for them.
   */
  async function flush() {
    if (import.meta.server || sessionEnded.value) return
    if (sending.value) {
      again = true
      return
    }
    sending.value = true
    again = false
    let failed = false
    try {
      for (const e of [...mine.value]) {
        // checked again right before each send, with no await in between: a switch of person
        // while this loop runs must not send the previous person's next step with the new cookie
        if (sessionEnded.value || e.owner?.id !== me.value?.id) {
          again = true
          break
        }
        e.tries++
        try {
          const result = e.files ? await sendPhotos(e) : await $fetch(urlOf(e), { method: 'POST', body: bodyOf(e) })
          await settle(e, 'done', { result })
        }
        catch (err) {
          const outcome = outcomeOf(statusOf(err))
          if (outcome !== 'refused') {
            if (outcome === 'sign-in') sessionEnded.value = e.owner ?? null
            await save(e)
            failed = true
            break
          }
          const data = (err as { data?: { message?: string } }).data
          await settle(e, 'refused', { message: data?.message ?? 'The server refused this action' })
        }
      }
    }
    finally {
      sending.value = false
    }
    if (again && !failed) await flush()
  }

  /**
   * A lead takes the entries nobody is recorded for (queued before the outbox recorded who
   * tapped) on as theirs, after confirming on the page: they then go out under the lead's name,
   * so the register names the person who vouched for them.
   */
  async function adoptUnowned() {
    if (user.value?.role !== 'lead' || !me.value) return
    const adoptedAt = new Date().toISOString()
    for (const e of entries.value.filter(x => x.status === 'pending' && !x.owner)) {
      Object.assign(e, { owner: me.value, adoptedAt })
      await save(e)
    }
    await flush()
  }

  function onSettled(fn: (e: OutboxEntry) => void) {
    settled.add(fn)
    return () => settled.delete(fn)
  }

  async function cachePut(key: string, value: unknown) {
    await (await outboxDb()).put('cache', JSON.parse(JSON.stringify(value)), key)
  }
  /** Forgets every page's offline copy (signing out: the next person must not read them). */
  async function clearCache() {
    await (await outboxDb()).clear('cache')
  }
  async function cacheGet<T>(key: string): Promise<T | undefined> {
    return (await (await outboxDb()).get('cache', key)) as T | undefined
  }

  return { entries, pending, mine, me, sessionEnded, history, recentRefusal, sending, uploading, start, enqueue, flush, adoptUnowned, onSettled, cachePut, cacheGet, clearCache }
})
