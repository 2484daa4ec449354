// The type a route answers, as Nitro infers it from the handler (the same table `useFetch`
// and `$fetch` read), for code that holds an answer it did not fetch itself (the outbox hands
// back an action's result), and `callRoute` for the calls whose address `$fetch` cannot type.
import type { InternalApi } from 'nitropack/types'

export type ApiAnswer<Route extends keyof InternalApi, Method extends keyof InternalApi[Route]> = InternalApi[Route][Method]

type RouteMethod<Route extends keyof InternalApi> = Extract<keyof InternalApi[Route], string>

/** Nuxt's global $fetch with its route matching set aside (read at call time: it is set when the app starts). */
type UntypedFetch = (url: string, opts: { method: string; body?: Record<string, unknown> }) => Promise<unknown>

/**
 * Calls one route by its pattern ('/api/photos/:id') with the path's values filled in, and
 * answers the handler's type. For a written-out address with a body (a PATCH of
 * `/api/photos/${id}`), `$fetch` matches the address against every route pattern and vue-tsc
 * stops with "excessive stack depth"; naming the route here needs no matching.
 */
export function callRoute<Route extends keyof InternalApi, Method extends RouteMethod<Route>>(
  route: Route, method: Method, params: Record<string, string | number>, body?: Record<string, unknown>,
): Promise<ApiAnswer<Route, Method>> {
  const url = String(route).replace(/:(\w+)/g, (_, name: string) => {
    if (params[name] === undefined) throw new Error(`callRoute: no value for :${name} in ${String(route)}`)
    return encodeURIComponent(String(params[name]))
  })
  return ($fetch as UntypedFetch)(url, { method: method.toUpperCase(), body }) as Promise<ApiAnswer<Route, Method>>
}
