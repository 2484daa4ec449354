// Ends the session on this device and goes where the server says: a shared tablet back to its
// person picker, any other device to sign-in (the device cookie is httpOnly, so only the
// server can tell; server/api/auth/logout.post.ts). The device's offline copies of the
// person's pages and cards go with the session (app/utils/offline-copies.ts).
export function useSignOut() {
  const { clear } = useUserSession()
  const live = useLiveStore()
  const outbox = useOutboxStore()
  return async function signOut() {
    const { next } = await $fetch<{ next: string }>('/api/auth/logout', { method: 'POST' })
    live.disconnect()
    await clearOfflineCopies(() => outbox.clearCache())
    await clear()
    await navigateTo(next)
  }
}
