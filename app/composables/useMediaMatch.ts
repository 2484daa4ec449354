// Runs `act` once the screen matches a media query: at once when it already does, else when it
// comes to (a phone turned sideways, a window widened). It starts in `start` (the component's
// mount by default, or onNuxtReady), so the server's render and the hydration never depend on
// the screen's width; the listener goes with the component.
export function whenMediaMatches(query: string, act: () => void, start: (fn: () => void) => void = onMounted) {
  let list: MediaQueryList | undefined
  const changed = (e: MediaQueryListEvent) => {
    if (!e.matches) return
    list?.removeEventListener('change', changed)
    act()
  }
  start(() => {
    list = window.matchMedia(query)
    if (list.matches) act()
    else list.addEventListener('change', changed)
  })
  onBeforeUnmount(() => list?.removeEventListener('change', changed))
}
