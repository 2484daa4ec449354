// Lets a page react to live events of some types while it is mounted; `onCatchUp` runs
// after a reconnect (default: the handler with a catch-up event). Called in the page's setup,
// next to its read: events heard from then until the page mounts are handed to it on mounting
// (app/stores/live.ts keeps them), so a page opened by a link misses none that its read did not see.
import type { LiveCatchUp, LiveEvent, LiveEventType } from '#shared/types/live'

export function useLiveEvents<T extends LiveEventType>(types: readonly T[], onEvent: (e: Extract<LiveEvent, { type: T }> | LiveCatchUp) => void, onCatchUp?: () => void) {
  const live = useLiveStore()
  const wanted = new Set<LiveEventType>(types)
  let stop: (() => void) | undefined
  const since = live.mark()
  onMounted(() => {
    stop = live.listen({
      match: e => wanted.has(e.type),
      onEvent: e => onEvent(e as Extract<LiveEvent, { type: T }>),
      onCatchUp: onCatchUp ?? (() => onEvent({ type: 'catch-up', id: 0 })),
    }, since)
  })
  onBeforeUnmount(() => stop?.())
}
