// The finisher's queue (the finishing page): pieces by where they are, read from
// GET /api/finishing and kept on the tablet (the outbox's cache) for when the Wi-Fi is down.
// Every action goes through the outbox (app/stores/outbox.ts), so a Wi-Fi drop loses nothing:
// the card moves at once ("sending…") and the server's answer replaces it. Live piece and
// dispatch events read the queue again.
import { FINISHING_STEPS, FINISHING_TIMER_STEPS, type FinishingActionKind, type FinishingPieceState, type FinishingTimerKind } from '#shared/utils/finishing-steps'
import { constantWeight, dryness } from '#shared/utils/plaster-drying'
import type { ApiAnswer } from '~/utils/api-answer'

const readQueue = () => $fetch('/api/finishing')
export type FinishingQueueData = Awaited<ReturnType<typeof readQueue>>
export type FinishingPiece = FinishingQueueData['toFettle'][number]
/** What a piece action answers (POST /api/pieces/:id/actions), as the outbox hands it back. */
type FinishingActionAnswer = ApiAnswer<'/api/pieces/:id/actions', 'post'>

const LABEL: Record<FinishingActionKind, string> = {
  fettled: 'Fettled', weighed: 'Weighed', ready: 'Ready', repair: 'To repair', repaired: 'Repaired', rejected: 'Rejected', packed: 'Packed',
  fettle_start: 'Fettling started', fettle_stop: 'Fettling stopped', repair_start: 'Repair started', repair_stop: 'Repair stopped',
}

export function useFinishingQueue() {
  const outbox = useOutboxStore()
  const { user } = useUserSession()
  // one copy per person, like the floor's: a tablet shared by finishers never shows one the other's copy
  const cacheKey = computed(() => `finishing:${user.value?.id ?? 0}`)
  const queue = ref<FinishingQueueData | null>(null)
  const offlineCopy = ref(false)
  /** What the last answered weighing said, for the status line. */
  const lastAnswer = ref('')

  async function load() {
    try {
      const r = await readQueue()
      const held = all.value
      for (const list of ['toFettle', 'repair', 'drying', 'ready', 'packed'] as const) r[list] = keepNewerRows(held, r[list], p => p.id, p => p.version)
      queue.value = r
      offlineCopy.value = false
      await outbox.cachePut(cacheKey.value, r)
    }
    catch {
      queue.value ??= (await outbox.cacheGet<FinishingQueueData>(cacheKey.value)) ?? null
      offlineCopy.value = true
    }
  }

  /** Every piece the queue holds, in the server's order (to fettle first, most urgent job first). */
  const all = computed<FinishingPiece[]>(() => {
    const q = queue.value
    return q ? [...q.toFettle, ...q.repair, ...q.drying, ...q.ready, ...q.packed] : []
  })
  const pendingFor = (pieceId: number) => outbox.pending.filter(e => e.pieceId === pieceId)
  /** The state a card shows: the server's, moved on by this tablet's actions not yet answered. */
  function stateOf(p: FinishingPiece): FinishingPieceState {
    const last = pendingFor(p.id).at(-1)
    return last ? FINISHING_STEPS[last.kind as FinishingActionKind].to : p.state
  }
  /**
   * The card's piece: the server's, with weighings still in the outbox added to its spell
   * (worked out here with the same `dryness` and `constantWeight`), so a finisher offline can
   * weigh and then mark ready.
   */
  function shownPiece(server: FinishingPiece): FinishingPiece {
    // a timer started or stopped on this tablet shows at once, like a state
    const tick = pendingFor(server.id).filter(e => e.kind in FINISHING_TIMER_STEPS).at(-1)
    const step = tick ? FINISHING_TIMER_STEPS[tick.kind as FinishingTimerKind] : null
    const p = step ? { ...server, timer: step.start ? { work: step.work, since: tick!.tappedAt, by: null } : null } : server
    const queued = pendingFor(p.id).filter(e => e.kind === 'weighed' && Number(e.body.weighedKg) > 0)
      .map(e => ({ kg: Number(e.body.weighedKg), at: typeof e.body.at === 'string' ? e.body.at : e.tappedAt }))
    const w = queued.at(-1)
    if (!w) return p
    const d = dryness({ weighedKg: w.kg, dryMassKg: p.dryMassKg })
    const weighings = [...p.weighings, ...queued]
    return {
      ...p,
      lastWeighing: { kg: w.kg, at: w.at, freeWaterKg: d.freeWaterKg, freeWaterPct: d.freeWaterPct },
      weighings,
      constantWeight: constantWeight(weighings.map(x => ({ kg: x.kg, at: new Date(x.at) }))),
    }
  }
  /** The pieces a tab shows, as this tablet knows them. */
  const inState = (s: FinishingPieceState) => all.value.filter(p => stateOf(p) === s).map(shownPiece)
  const count = (s: FinishingPieceState) => all.value.filter(p => stateOf(p) === s).length

  async function act(p: FinishingPiece, kind: FinishingActionKind, body: Record<string, unknown>) {
    // each step moves the version on by one: a queued chain names the versions it will meet
    const version = p.version + pendingFor(p.id).length
    await outbox.enqueue({ url: `/api/pieces/${p.id}/actions`, pieceId: p.id, kind, label: `${p.mark} · ${LABEL[kind]}`, body: { ...body, version } })
  }

  function replace(piece: FinishingPiece) {
    const q = queue.value
    if (!q) return
    const lists = [q.toFettle, q.repair, q.drying, q.ready, q.packed]
    const i = lists.findIndex(l => l.some(x => x.id === piece.id))
    if (i < 0) return
    const old = lists[i]!.find(x => x.id === piece.id)!
    if (piece.version < old.version) return
    lists[i]!.splice(lists[i]!.indexOf(old), 1, piece)
  }

  const lastRefusal = computed(() => outbox.recentRefusal(e => e.pieceId !== undefined))

  const { now } = useTabletPage({
    load,
    tickMs: 30_000,
    events: ['piece.created', 'piece.updated', 'dispatch.created'],
    settled(e) {
      if (!e.pieceId) return
      const r = e.result as FinishingActionAnswer | undefined
      if (r?.piece) replace(r.piece)
      if (r?.dryness) {
        lastAnswer.value = `${r.piece.mark}: ${r.dryness.constantWeight.isDry ? 'constant weight, dry: it can be marked ready' : r.dryness.constantWeight.message}`
      }
      if (r?.jobReady && r.piece.job) lastAnswer.value = `${r.piece.job.code} is ready for dispatch: every piece it needs is ready.`
    },
  })

  return { queue, offlineCopy, lastAnswer, lastRefusal, now, pendingFor, stateOf, inState, count, act }
}
