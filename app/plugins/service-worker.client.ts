// Registers the service worker (built by @vite-pwa/nuxt: nuxt.config.ts says what it keeps) for
// shop staff, once the page is interactive, so a tablet's /floor and /finishing open again
// without Wi-Fi. Clients' phones never get it (they read their jobs online, and need not
// download the shop's app); a worker left by staff on a device a client signs in on is removed.
// Service workers run only on https or localhost (W3C Service Workers §2.2, secure contexts):
// over plain http on the shop network the tablets work as before, without an offline reload.
const STAFF = new Set(['lead', 'caster', 'finisher'])

export default defineNuxtPlugin(() => {
  if (!('serviceWorker' in navigator) || !window.isSecureContext) return
  const { user } = useUserSession()
  onNuxtReady(() => {
    watch(() => user.value?.role, async (role) => {
      try {
        if (role && STAFF.has(role)) await navigator.serviceWorker.register('/sw.js', { scope: '/' })
        else if (role === 'client') for (const r of await navigator.serviceWorker.getRegistrations()) await r.unregister()
      }
      catch {
        // no worker (a development server, a browser refusing it): the app works online as ever
      }
    }, { immediate: true })
  })
})
