// Pages: a Content Security Policy that allows Nuxt's own inline scripts by their SHA-256 hash
// (W3C CSP Level 3, hash-source), taken from the head and the end of the body that the framework
// writes, never from the app's rendered markup; and no X-Powered-By, which only tells an attacker
// what to try (OWASP HTTP Headers Cheat Sheet). In development Vite injects scripts of its own, so
// the page policy is left out there.
import { inlineScriptHashes, pagePolicy } from '../utils/security-headers'

export default defineNitroPlugin((nitroApp) => {
  nitroApp.hooks.hook('render:html', (html, { event }) => {
    event.context.scriptHashes = [...html.head, ...html.bodyAppend].flatMap(inlineScriptHashes)
  })
  nitroApp.hooks.hook('render:response', (response, { event }) => {
    if (response.headers) delete response.headers['x-powered-by']
    if (import.meta.dev) return
    const type = String(response.headers?.['content-type'] ?? '')
    if (!type.startsWith('text/html')) return
    response.headers = { ...response.headers, 'content-security-policy': pagePolicy(event.context.scriptHashes ?? [], getRequestHeader(event, 'host')) }
  })
})
