// Sends signed-out visitors to sign-in, and each role away from pages that are not theirs.
import { ROLE_HOME } from '#shared/types/auth'

export default defineNuxtRouteMiddleware(async (to) => {
  const { loggedIn, user } = useUserSession()
  if (to.meta.public) {
    if (to.path === '/login' && loggedIn.value && user.value) return navigateTo(ROLE_HOME[user.value.role])
    return
  }
  if (!loggedIn.value || !user.value) {
    // a shared tablet with no one on it shows its person picker; the device cookie is
    // httpOnly, so only the server rendering the first page can see it
    if (import.meta.server && useCookie(TABLET_COOKIE).value) return navigateTo('/tablet')
    return navigateTo({ path: '/login', query: to.fullPath !== '/' ? { next: to.fullPath } : {} })
  }
  const home = ROLE_HOME[user.value.role]
  if (to.path === '/') return navigateTo(home)
  if (to.meta.roles && !to.meta.roles.includes(user.value.role)) return navigateTo(home)
})
