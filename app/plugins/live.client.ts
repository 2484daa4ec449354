// Opens the live connection while someone is signed in.
export default defineNuxtPlugin(() => {
  const { loggedIn } = useUserSession()
  const live = useLiveStore()
  watch(loggedIn, (on) => {
    if (on) live.connect()
    else live.disconnect()
  }, { immediate: true })
})
