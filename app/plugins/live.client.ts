// Opens the live connection while someone is signed in, once the page is interactive
// (onNuxtReady: after hydration, when the browser is idle), so the socket's client code and
// its handshake never hold up the first paint; a page loaded signed in shows "Not connected",
// then "Connecting…", until then. Pages that listen register before it opens. The connection
// says when the document's data was read (app/plugins/live-since.ts), so the server can tell
// whether the page missed an event meanwhile.
export default defineNuxtPlugin(() => {
  const { loggedIn } = useUserSession()
  const live = useLiveStore()
  const since = useState<number | null>('live-since')
  onNuxtReady(() => {
    watch(loggedIn, (on) => {
      if (on) void live.connect(since.value ?? undefined)
      else live.disconnect()
    }, { immediate: true })
  })
})
