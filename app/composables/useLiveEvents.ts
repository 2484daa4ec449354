// Lets a page react to live events of some types while it is mounted; `onCatchUp` runs
// after a reconnect (default: the same refresh).
import type { LiveEvent } from '#shared/types/live'

export function useLiveEvents(types: string[], onEvent: (e: LiveEvent) => void, onCatchUp?: () => void) {
  const live = useLiveStore()
  let stop: (() => void) | undefined
  onMounted(() => {
    stop = live.listen({ match: e => types.includes(e.type), onEvent, onCatchUp: onCatchUp ?? (() => onEvent({ type: 'catch-up', id: 0 })) })
  })
  onBeforeUnmount(() => stop?.())
}
