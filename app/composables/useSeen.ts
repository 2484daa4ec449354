// True once an element has come near the screen (within `margin` of the viewport), and from
// then on; also as a print starts, so a printed page carries what waited. For work the first
// screen does not need: the mix card's chart loads Chart.js only when its place is scrolled
// near, so a phone opening the card runs no chart code while the page is still loading.
export function useSeen(target: Ref<HTMLElement | null>, margin = '200px') {
  const seen = ref(false)
  let observer: IntersectionObserver | undefined
  const show = () => {
    seen.value = true
    observer?.disconnect()
    window.removeEventListener('beforeprint', show)
  }
  onMounted(() => {
    window.addEventListener('beforeprint', show)
    if (!('IntersectionObserver' in window) || !target.value) return show()
    observer = new IntersectionObserver(entries => entries.some(e => e.isIntersecting) && show(), { rootMargin: margin })
    observer.observe(target.value)
  })
  onBeforeUnmount(() => {
    observer?.disconnect()
    window.removeEventListener('beforeprint', show)
  })
  return seen
}
