// Ends the session on this device and goes where the server says: a shared tablet back to its
// person picker, any other device to sign-in (the device cookie is httpOnly, so only the
// server can tell; server/api/auth/logout.post.ts).
export function useSignOut() {
  const { clear } = useUserSession()
  const live = useLiveStore()
  return async function signOut() {
    const { next } = await $fetch<{ next: string }>('/api/auth/logout', { method: 'POST' })
    live.disconnect()
    await clear()
    await navigateTo(next)
  }
}
