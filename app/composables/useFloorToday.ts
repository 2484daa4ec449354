// The caster's day (the floor page): today's pours as cards, read from GET /api/floor/today and
// kept on the tablet (the outbox's cache, one copy per user) so the cards and their countdowns
// stay up while offline. Every action goes through the outbox (app/stores/outbox.ts): the card
// shows the step at once ("sending…") and the server's answer replaces it. Live pour and piece
// events read the day again.
import type { PourState } from '#shared/types/board'
import { FLOOR_STEPS, type FloorActionKind } from '#shared/utils/floor-steps'
import { pourWindowFromSteps } from '#shared/utils/pour-status'
import type { ApiAnswer } from '~/utils/api-answer'

const readToday = () => $fetch('/api/floor/today')
export type FloorTodayData = Awaited<ReturnType<typeof readToday>>
type FloorCard = FloorTodayData['cards'][number]
/** What a pour action answers (POST /api/pours/:id/actions), as the outbox hands it back. */
type FloorActionAnswer = ApiAnswer<'/api/pours/:id/actions', 'post'>

const LABEL: Record<FloorActionKind, string> = { start_mixing: 'Start mixing', poured: 'Poured', demoulded: 'Demoulded' }

export function useFloorToday() {
  const { user } = useUserSession()
  const outbox = useOutboxStore()
  const today = ref<FloorTodayData | null>(null)
  const offlineCopy = ref(false)
  const cacheKey = computed(() => `today:${user.value?.id ?? 0}`)

  async function load() {
    try {
      const r = await readToday()
      r.cards = keepNewerRows(today.value?.cards, r.cards, c => c.pour.id, c => c.pour.version)
      today.value = r
      offlineCopy.value = false
      await outbox.cachePut(cacheKey.value, r)
    }
    catch {
      today.value ??= (await outbox.cacheGet<FloorTodayData>(cacheKey.value)) ?? null
      offlineCopy.value = true
    }
  }

  const pendingFor = (pourId: number) => outbox.pending.filter(e => e.pourId === pourId)
  /** The state the card shows: the server's, moved on by this tablet's actions not yet answered. */
  function stateOf(pourId: number, server: PourState): PourState {
    const last = pendingFor(pourId).at(-1)
    return last ? (FLOOR_STEPS[last.kind as FloorActionKind].to as PourState) : server
  }

  /**
   * The card as this tablet knows it: steps taken here and not yet answered (offline, say) move
   * the window to the real start of mixing, as the server will, so the countdown never runs on
   * the old planned window.
   */
  function withSteps(c: FloorCard): FloorCard {
    const steps = pendingFor(c.pour.id).map(e => ({ kind: e.kind, at: typeof e.body.at === 'string' ? e.body.at : e.tappedAt }))
    const pour = pourWindowFromSteps(c.pour, steps)
    return pour === c.pour ? c : { ...c, pour }
  }

  async function act(pourId: number, kind: FloorActionKind, body: Record<string, unknown>) {
    const card = today.value?.cards.find(c => c.pour.id === pourId)
    if (!card) return
    // each step moves the version on by one: a queued chain names the versions it will meet
    const version = card.pour.version + pendingFor(pourId).length
    await outbox.enqueue({ url: `/api/pours/${pourId}/actions`, pourId, kind, label: `${card.mould.code} · ${LABEL[kind]}`, body: { ...body, version } })
  }

  /** Open pours in slot order first; demoulded ones drop to the end of the day's list. */
  const cards = computed(() => [...(today.value?.cards ?? [])].sort((a, b) =>
    Number(stateOf(a.pour.id, a.pour.state) === 'demoulded') - Number(stateOf(b.pour.id, b.pour.state) === 'demoulded')))

  const lastRefusal = computed(() => outbox.recentRefusal(e => e.pourId !== undefined))

  const { now } = useTabletPage({
    load,
    tickMs: 1000,
    events: ['pour.created', 'pour.updated', 'pour.voided', 'piece.created'],
    settled(e) {
      const card = (e.result as FloorActionAnswer | undefined)?.card
      const list = today.value?.cards
      const i = list?.findIndex(c => c.pour.id === card?.pour.id) ?? -1
      if (card && list && i >= 0 && card.pour.version >= list[i]!.pour.version) list[i] = card
    },
  })

  return { today, offlineCopy, cards, now, lastRefusal, pendingFor, stateOf, withSteps, act }
}
