// The access matrix: every route of tests/api/route-table.ts × caller (signed out, lead, caster,
// finisher, client) × scope (own workshop, another workshop, another client's job). Each cell's
// expected answer comes from the row through `expected()`; a route fails on any leak (an answer
// where a refusal was due, or another workshop's or client's rows in an answer) and on any
// refusal where the caller should have got through. Each role signs in once (scrypt is slow on
// purpose) and the cookies are reused for every cell.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { call, freshSession, signIn, type CallResult } from '../setup/http'
import { DEMO_PASSWORD, closeTestDb, demo } from '../setup/fixtures'
import { SCOPES, makeScopes, type Kind, type ScopeName, type Scopes } from '../setup/scopes'
import { CALLERS, ROUTES, expected, routesOnDisk, type Caller, type RouteRow } from './route-table'

const cookies: Partial<Record<Caller, string>> = {}
let scopes: Scopes
const who = { lead: demo.lead, caster: demo.caster1, finisher: demo.finisher, client: demo.client1 }

beforeAll(async () => {
  await Promise.all(Object.entries(who).map(async ([role, u]) => {
    cookies[role as Caller] = await signIn(u.email, DEMO_PASSWORD)
  }))
  scopes = await makeScopes(cookies.lead!)
})
afterAll(async () => {
  await scopes?.cleanup()
  await closeTestDb()
})

describe('route table', () => {
  it('names every route file under server/api, once', () => {
    expect(ROUTES.map(r => r.route).sort()).toEqual(routesOnDisk().map(r => r.route).sort())
  })
})

/** Sends one cell's request: the row's path, query and body with the scope's rows. */
async function send(row: RouteRow, caller: Caller, scope: ScopeName, succeed: boolean, used: Set<Kind>): Promise<CallResult> {
  const s = scopes.request(scope, succeed, used)
  const [method, template] = row.route.split(' ') as [string, string]
  let path = template
  for (const [param, kind] of Object.entries(row.ids ?? {})) path = path.replace(`[${param}]`, String(await s.id(kind)))
  for (const [param, value] of Object.entries(row.params ?? {})) path = path.replace(`[${param}]`, value)
  if (row.query) path += `?${row.query}`
  const body = row.body ? await row.body(s) : undefined
  const form = row.form ? await row.form(s) : undefined
  // a call that ends its session gets one of its own, so the caller's cookie stays live for the other cells
  const cookie = caller === 'anon' ? undefined : row.endsSession && succeed ? await freshSession(who[caller].email, DEMO_PASSWORD) : cookies[caller]
  return call(path, { method, cookie, body, form })
}

const text = (r: CallResult) => (typeof r.data === 'string' ? r.data : JSON.stringify(r.data ?? ''))
const shown = (r: CallResult) => `${r.status} ${text(r).slice(0, 160)}`

describe('access matrix', () => {
  for (const row of ROUTES) {
    const roles = row.roles === 'public' ? 'public' : row.roles.join(', ')
    it(`${row.route} (${roles})`, async () => {
      const used = new Set<Kind>()
      const own = new Map<Caller, CallResult>()
      const problems: string[] = []
      // refusals first, so a standing row is still there for the callers who may use it
      const order = [...CALLERS].sort((a, b) => Number(expected(row, a, 'own', true) === 'ok') - Number(expected(row, b, 'own', true) === 'ok'))
      for (const scope of SCOPES) {
        const differs = scope === 'own' || scopes.differs(scope, used)
        for (const caller of order) {
          const want = expected(row, caller, scope, differs)
          const cell = `${caller} × ${scope}`
          if (want === 'same') continue
          if (want === 'no-leak') {
            const answer = text(own.get(caller)!)
            const leaked = scopes.markers[scope as 'other' | 'otherClient'].filter(m => answer.includes(m))
            if (leaked.length) problems.push(`${cell}: the answer shows ${leaked.join(', ')}`)
            continue
          }
          const r = await send(row, caller, scope, want === 'ok', used)
          if (scope === 'own') own.set(caller, r)
          const ok = want === 'ok' ? r.status >= 200 && r.status < 300 : r.status === want
          if (!ok) problems.push(`${cell}: expected ${want}, got ${shown(r)}`)
        }
      }
      expect(problems).toEqual([])
    }, row.endsSession ? 120_000 : undefined) // a sign-in (scrypt, slow on purpose) per caller
  }
})
