// The pour board's data and actions, owned in one place so the page is wiring: the fetch key,
// the lean wire form expanded once per fetch (types as Nitro infers them from the routes), the
// live patch (one pour's change redraws that bar only), and the actions the lead takes: move,
// stretch, void, create, and the planner's preview and accept. The server judges every change;
// a refusal lands in `error` (the planner's in `planError`, naming the proposal).
import type { BoardScreen, PourDto } from '#shared/types/board'
import { expandBoardPours } from '#shared/utils/board-lean'

export const BOARD_KEY = 'board'

/** The timeline's one method the board calls: redraw one pour's bar (BoardTimeline's expose). */
export interface BoardTimelineHandle { patchPour: (p: PourDto, removed: boolean) => void }

// plain string paths keep Nitro's typed-route inference out of template literals; the answer is
// the write routes' PourDto
const pourPath = (id: number, tail = ''): string => `/api/pours/${id}${tail}`
const POURS_PATH: string = '/api/pours'
const fetchPreview = (range: { from: string; to: string }) => $fetch('/api/planner/preview', { method: 'POST', body: range })
export type BoardPlanPreview = Awaited<ReturnType<typeof fetchPreview>>

export async function useBoard(range: MaybeRefOrGetter<{ from: string; to: string }>) {
  const query = computed(() => toValue(range))
  // composables that read the Nuxt instance go before the first await (it is gone after it on the server)
  const t = useWorkshopTime(() => data.value?.workshop.timezone ?? 'UTC')
  // live events register on the page's mount, so before the await too; they arrive after the fetch
  useLiveEvents(['pour.created', 'pour.updated', 'pour.voided', 'board.refreshed'], (e) => {
    if (e.type === 'board.refreshed' || e.type === 'catch-up' || !data.value) return refresh()
    patch(e.row, e.type === 'pour.voided')
  })
  const { data: wire, error: loadError, refresh } = await useFetch('/api/board', { query, key: BOARD_KEY })
  // the board as the components read it: expanded once per fetch, then patched pour by pour
  const data = shallowRef<BoardScreen | null>(null)
  watch(wire, (w) => {
    data.value = w ? { ...w, pours: expandBoardPours(w) } : null
  }, { immediate: true })
  /** Bound by the page to the timeline component (ref="timeline"). */
  const timeline = ref<BoardTimelineHandle | null>(null)

  const inRange = (p: PourDto) => p.slotEnd > t.toInstant(query.value.from, '00:00') && p.slotStart < t.toInstant(query.value.to, '00:00')
  /** Applies one pour's live change: the list and the one bar, no refetch (a reconnect or a plan accept reloads). */
  function patch(row: PourDto, voided: boolean) {
    const screen = data.value
    if (!screen) return
    const removed = voided || row.state === 'void' || !inRange(row)
    const old = screen.pours.find(p => p.id === row.id)
    if (old && old.version >= row.version && !removed) return
    const rest = screen.pours.filter(p => p.id !== row.id)
    data.value = { ...screen, pours: removed ? rest : [...rest, row].sort((a, b) => a.slotStart.localeCompare(b.slotStart) || a.id - b.id) }
    timeline.value?.patchPour(row, removed)
  }

  const message = ref('')
  const error = ref('')
  const busy = ref(false)
  let lastError: unknown = null
  async function act<T>(fn: () => Promise<T>, done?: (r: T) => string, onFail?: () => void) {
    busy.value = true
    error.value = ''
    message.value = ''
    try {
      const r = await fn()
      if (done) message.value = done(r)
      await refresh()
      return true
    }
    catch (e) {
      error.value = apiErrorMessage(e)
      lastError = e
      onFail?.()
      return false
    }
    finally {
      busy.value = false
    }
  }
  const warned = (p: PourDto) => (p.warnings.length ? ` Warnings: ${p.warnings.join(' ')}` : '')

  /** Moves a planned pour (a drag or the dialog); `revert` puts a dragged bar back on refusal. */
  function move(p: { pour: PourDto; mouldId: number; slotStart: string; revert?: () => void }) {
    return act(() => $fetch<PourDto>(pourPath(p.pour.id), { method: 'PATCH', body: { version: p.pour.version, mouldId: p.mouldId, slotStart: p.slotStart } }),
      r => `Moved ${r.jobCode ?? 'the pour'} to ${r.mouldCode} at ${t.clock(r.slotStart)}.${warned(r)}`, p.revert)
  }
  /** Stretching a bar asks for a longer or shorter set: a retarder or an accelerator (set factor). */
  function stretch(p: { pour: PourDto; slotEnd: string; revert: () => void }) {
    const setBefore = Date.parse(p.pour.demouldOpenAt) - Date.parse(p.pour.mixAt)
    const grown = Date.parse(p.slotEnd) - Date.parse(p.pour.slotEnd)
    const setFactor = Math.min(3, Math.max(0.3, Math.round(p.pour.setFactor * ((setBefore + grown) / setBefore) * 100) / 100))
    return act(() => $fetch<PourDto>(pourPath(p.pour.id), { method: 'PATCH', body: { version: p.pour.version, setFactor } }),
      r => `Set factor ${r.setFactor} for ${r.jobCode ?? 'the pour'}: demould from ${t.clock(r.demouldOpenAt)}.${warned(r)}`, p.revert)
  }
  function voidPour(p: { pour: PourDto; reason: string }) {
    return act(() => $fetch<PourDto>(pourPath(p.pour.id, '/void'), { method: 'POST', body: { version: p.pour.version, reason: p.reason } }), () => 'Pour voided.')
  }
  function create(body: { mouldId: number; slotStart: string; jobItemId?: number; casterId?: number; isSample?: boolean }) {
    return act(() => $fetch<PourDto>(POURS_PATH, { method: 'POST', body }), r => `Planned ${r.jobCode ?? 'a pour'} on ${r.mouldCode} at ${t.clock(r.slotStart)}.${warned(r)}`)
  }

  // the planner: its From/To are its own (paging the board leaves them alone), and a preview
  // keeps the range it was made for, so Accept sends exactly what the lead saw
  const planRange = ref({ from: t.addDays(t.today(), 1), to: t.addDays(t.today(), 7) })
  const plan = ref<(BoardPlanPreview & { range: { from: string; to: string } }) | null>(null)
  const planError = ref('')
  async function preview(r: { from: string; to: string }) {
    planError.value = ''
    const asked = { ...r }
    await act(async () => {
      plan.value = { ...await fetchPreview(asked), range: asked }
    })
  }
  async function accept() {
    const p = plan.value
    if (!p) return
    planError.value = ''
    const pours = p.pours.map(x => ({ jobItemId: x.jobItemId, mouldId: x.mouldId, slotStart: x.slotStart, casterId: x.casterId }))
    const ok = await act(() => $fetch<{ created: number }>('/api/planner/accept', { method: 'POST', body: { ...p.range, pours } }),
      r => `Plan accepted: ${r.created} pours written.`,
      () => {
        planError.value = planRefusal(p.pours, lastError)
        error.value = ''
      })
    if (ok) plan.value = null
  }
  function discardPlan() {
    plan.value = null
    planError.value = ''
  }
  /** Which previewed pour the server refused and why, in words: job, mould and time. */
  function planRefusal(pours: BoardPlanPreview['pours'], e: unknown) {
    const detail = (e as { data?: { data?: { pourIndex?: number; problems?: { field: string }[] } } })?.data?.data
    const field = detail?.problems?.[0]?.field.match(/^pours\.(\d+)\./)
    const index = detail?.pourIndex ?? (field ? Number(field[1]) : undefined)
    const reason = apiErrorMessage(e).replace(/^pours\.\d+\.\w+: /, '')
    const p = index === undefined ? undefined : pours[index]
    const which = p ? `${p.jobCode} on ${p.mouldCode} at ${t.when(p.slotStart)} can no longer be placed` : 'The plan can no longer be placed'
    return `${which}: ${reason}. Nothing was written; preview again to plan around it.`
  }

  const warnings = computed(() => (data.value?.pours ?? []).filter(p => p.warnings.length || p.overdue))

  return {
    data, loadError, refresh, t, timeline, patch,
    message, error, busy,
    move, stretch, voidPour, create,
    planRange, plan, planError, preview, accept, discardPlan,
    warnings,
  }
}
