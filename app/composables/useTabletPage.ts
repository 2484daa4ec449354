// What the two tablet pages (the caster's floor, the finisher's queue) share: a clock that
// ticks for the countdowns, the outbox started and listened to, the page read when it opens,
// and live events that read it again (on reconnect the outbox sends what waited first).
import type { LiveEventType } from '#shared/types/live'
import type { OutboxEntry } from '~/stores/outbox'

export function useTabletPage(opts: { load: () => Promise<void>; settled: (e: OutboxEntry) => void; events: LiveEventType[]; tickMs: number }) {
  const outbox = useOutboxStore()
  const now = ref(Date.now())
  let stopSettled: (() => void) | undefined
  let tick: ReturnType<typeof setInterval> | undefined
  onMounted(async () => {
    tick = setInterval(() => (now.value = Date.now()), opts.tickMs)
    stopSettled = outbox.onSettled((e) => {
      opts.settled(e)
      // a refusal means the page's picture was wrong: read it again
      if (e.status === 'refused') void opts.load()
    })
    await outbox.start()
    await opts.load()
  })
  onBeforeUnmount(() => {
    clearInterval(tick)
    stopSettled?.()
  })
  useLiveEvents(opts.events, () => opts.load(), () => {
    void outbox.flush()
    void opts.load()
  })
  return { now, outbox }
}
