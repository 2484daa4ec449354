// Bad input everywhere: for every route of tests/api/route-table.ts that takes a body, a query
// or path parameters, a seeded generator (fast-check, FC_SEED to explore) sends wrong types,
// missing fields, huge strings, negative and non-finite numbers (as JSON text, 1e309, and as
// strings), unknown enum values, SQL-looking text, text with a NUL character, days and instants
// in years 0, 1000 and 10000, malformed JSON and bad ids in the path.
// Field names come from the shared zod schema the route file validates with (found in its
// source), and the same schema, run here, says what the answer must be: a 422 naming the same
// fields, or a 400 for malformed JSON; never a 500. Each route's cases must leave the database
// as it was: row counts and an md5 of every row of every table, before and after.
import { readdirSync } from 'node:fs'
import { join } from 'node:path'
import fc from 'fast-check'
import pLimit from 'p-limit'
import type { ZodType } from 'zod'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { baseUrl, call, freshSession, signIn, type CallResult } from '../setup/http'
import { DEMO_PASSWORD, closeTestDb, demo, testDb } from '../setup/fixtures'
import { makeScopes, type Scopes } from '../setup/scopes'
import { jpegWithGps, photoForm } from '../setup/photo-fixtures'
import { ROUTES, routesOnDisk, type RouteRow } from './route-table'
import { fieldsWithNul } from '#shared/utils/input-fields'
import { jsonBodyLimit } from '../../server/utils/body-limits'

const SEED = Number(process.env.FC_SEED ?? 20261202)
/** Random mutations per route on top of the sweep of every field. */
const RANDOM_CASES = 16
/** Malformed bodies per route, picked from MALFORMED. */
const MALFORMED_CASES = 4

// ---- the shared schemas, by exported name ----
const SCHEMA_DIR = join(import.meta.dirname, '..', '..', 'shared', 'utils')
const SCHEMAS = new Map<string, ZodType>()
for (const file of readdirSync(SCHEMA_DIR).filter(f => f.endsWith('-schemas.ts') || f === 'mix-request.ts')) {
  const mod: Record<string, unknown> = await import(join(SCHEMA_DIR, file))
  for (const [name, value] of Object.entries(mod)) {
    if ((value as { _zod?: unknown })?._zod) SCHEMAS.set(name, value as ZodType)
  }
}

type Where = 'params' | 'query' | 'body' | 'fields'
const CALLS: [Where, RegExp][] = [
  ['params', /validParams\(event, (\w+)\)/], ['query', /validQuery\(event, (\w+)\)/],
  ['body', /validBody\(event, (\w+)\)/], ['fields', /parseOr422\((\w+), fields\)/],
]
/** The schemas a route file validates with, in the order it checks them. */
function inputsOf(source: string) {
  const found = CALLS.map(([where, rx]) => ({ where, m: source.match(rx) })).filter(x => x.m)
  found.sort((a, b) => a.m!.index! - b.m!.index!)
  return found.map(x => ({ where: x.where, name: x.m![1]!, schema: SCHEMAS.get(x.m![1]!) }))
}
const SOURCES = new Map(routesOnDisk().map(r => [r.route, r.source]))

/** The top-level field names of a schema (objects, refined objects, unions, transforms). */
function keysOf(schema: unknown): string[] {
  const def = (schema as { _zod?: { def: Record<string, any> } })?._zod?.def
  if (!def) return []
  if (def.type === 'object') return Object.keys(def.shape)
  if (def.type === 'pipe') return keysOf(def.in)
  if (def.type === 'union') return [...new Set<string>(def.options.flatMap(keysOf))]
  if (def.innerType) return keysOf(def.innerType)
  return []
}

/** The fields a 422 names for this value, as server/utils/errors.ts words them; null when valid. */
function problemFields(schema: ZodType, value: unknown, prefix?: string): string[] | null {
  // parseOr422 refuses text with a NUL character before the schema sees it
  const nul = fieldsWithNul(value)
  if (nul.length) return [...new Set(nul.map(f => [prefix, f].filter(Boolean).join('.') || prefix || 'body'))].sort()
  const r = schema.safeParse(value)
  if (r.success) return null
  return [...new Set(r.error.issues.map(i => [prefix, i.path.map(String).join('.')].filter(Boolean).join('.') || prefix || 'body'))].sort()
}

// ---- the bad values ----
/** A number written into the JSON text as is (1e309 parses to Infinity on the server). */
const raw = (text: string) => ({ '\u0000raw': text })
// longer than any text field allows (4000), while three of them stay under the 64 KiB body cap
const HUGE = 'x'.repeat(10_000)
const SQL = ['\' OR \'1\'=\'1', '1; DROP TABLE users; --', '\'); DELETE FROM jobs; --', '1 UNION SELECT password_hash FROM users']
const MISSING = Symbol('missing')
/** PostgreSQL cannot store a NUL character in text or jsonb. */
const NUL = 'x\u0000y'
/** Days and instants in years PostgreSQL has not (0), a typing slip (1000) and past 9999. */
const FAR_YEARS = ['1000-06-01', '10000-01-01', '0000-06-01T10:00:00Z', '1000-06-01T10:00:00Z', '+010000-01-01T00:00:00Z']
const BAD: unknown[] = [
  MISSING, null, true, 0, -1, -0.5, 1.5, 2 ** 31, Number.MAX_SAFE_INTEGER, 1e20, -1e20, raw('1e309'), raw('-1e309'),
  '', '   ', 'abc', 'NaN', 'Infinity', '-Infinity', '-1e309', '1e3', '2027-02-30', '0000-01-01', '9999-12-31',
  '9999-12-31T23:00:00Z', '+275760-09-13T00:00:00Z', 'not-a-kind', HUGE, ...SQL, {}, [], [null], { $gt: '' }, NUL, ...FAR_YEARS,
]
/** The sweep: every field gets the bad values for the type its schema (or its value) has. */
const SWEEP: Record<string, unknown[]> = {
  number: [MISSING, null, 'abc', -1, 1.5, 2 ** 31, raw('1e309'), '-1e309', SQL[1], {}],
  string: [MISSING, null, 12, '', HUGE, 'not-a-kind', '2027-02-30', '0000-01-01', SQL[1], NUL, ...FAR_YEARS],
  boolean: [MISSING, null, 'true', 1, {}],
  array: [MISSING, null, 'abc', [], [null]],
  object: [MISSING, null, 'abc', []],
}
const ANY = [...new Set(Object.values(SWEEP).flat())]
/** A schema's type under optional, nullable, default and transforms: 'number', 'string', 'enum'… */
function typeOf(schema: unknown): string {
  let def = (schema as { _zod?: { def: Record<string, any> } })?._zod?.def
  while (def && (def.innerType || def.type === 'pipe')) def = (def.innerType ?? def.in)?._zod?.def
  return def?.type ?? 'unknown'
}
/** The schema of a top-level field (in any option of a union). */
function fieldSchema(schema: unknown, key: string): unknown {
  const def = (schema as { _zod?: { def: Record<string, any> } })?._zod?.def
  if (!def) return undefined
  if (def.type === 'object') return def.shape[key]
  if (def.type === 'pipe') return fieldSchema(def.in, key)
  if (def.type === 'union') return def.options.map((o: unknown) => fieldSchema(o, key)).find(Boolean)
  return def.innerType ? fieldSchema(def.innerType, key) : undefined
}
function sweepOf(schema: unknown, value: unknown): unknown[] {
  const t = typeOf(schema)
  const type = t === 'enum' || t === 'literal' ? 'string' : t === 'tuple' ? 'array' : t !== 'unknown' ? t : Array.isArray(value) ? 'array' : value === null || value === undefined ? '' : typeof value
  return SWEEP[type] ?? ANY
}
/** Malformed or non-object JSON bodies. */
const MALFORMED = ['{', '{"a":', '[1,2', '{\'a\':1}', '{"a":1}}', 'nul', '{"a":NaN}', '{"a":01}', '\u0000', '[]', '"text"', '123', 'true']
const BAD_IDS = ['abc', '-1', '0', '1.5', '1e3', '99999999999999999999', '1;DROP TABLE users', '1 OR 1=1', ' 1', '1\u0000']
/** A version no row has: a valid body with it can only be refused (409), never written. */
const STALE_VERSION = 2_000_000_000

function toJson(body: unknown) {
  return JSON.stringify(body, (_k, v) => (v && typeof v === 'object' && '\u0000raw' in v ? `\u0000raw:${v['\u0000raw']}` : v))
    .replace(/"\\u0000raw:([^"]*)"/g, '$1')
}
const queryText = (v: unknown) => (typeof v === 'string' ? v.slice(0, 4000) : v && typeof v === 'object' && '\u0000raw' in v ? String((v as Record<string, string>)['\u0000raw']) : JSON.stringify(v))

type Path = (string | number)[]
/** The leaf paths of a JSON value: ['grade', 'consistency', 'min'], ['pours', 0, 'mouldId']. */
function leaves(value: unknown, at: Path = []): Path[] {
  if (value && typeof value === 'object' && !Array.isArray(value)) return Object.entries(value).flatMap(([k, v]) => leaves(v, [...at, k]))
  if (Array.isArray(value) && value.length && typeof value[0] === 'object') return leaves(value[0], [...at, 0])
  return at.length ? [at] : []
}
function setAt(base: unknown, path: Path, value: unknown): unknown {
  const copy = structuredClone(base) as Record<string | number, unknown>
  let node = copy
  for (const key of path.slice(0, -1)) {
    if (!node[key] || typeof node[key] !== 'object') node[key] = {}
    node = node[key] as Record<string | number, unknown>
  }
  const last = path.at(-1)!
  if (value === MISSING) Reflect.deleteProperty(node, last)
  else node[last] = value
  return copy
}

// ---- the cases of one route ----
type Want = { status: 422; fields: string[] } | { status: 400 | 413 | 415 } | { below: 500 } | { status: '4xx' }
interface Case { label: string; path: string; query?: Record<string, string | string[]>; body?: string; type?: string; form?: FormData; want: Want }

const cookies: Record<string, string> = {}
let scopes: Scopes
let jpeg: Buffer
let start: Record<string, string>

beforeAll(async () => {
  await Promise.all([['lead', demo.lead.email], ['caster', demo.caster1.email], ['finisher', demo.finisher.email], ['client', demo.client1.email]].map(async ([role, email]) => {
    cookies[role!] = await signIn(email!, DEMO_PASSWORD)
  }))
  scopes = await makeScopes(cookies.lead!)
  // a shared tablet of the demo workshop, for the routes that answer to its device cookie
  // (making the device a tablet ends the lead's session there: a session of its own for it)
  const tablet = await call('/api/tablets', { method: 'POST', cookie: await freshSession(demo.lead.email, DEMO_PASSWORD), body: { name: 'Bad-input tablet' } })
  const device = tablet.headers.getSetCookie().find(c => c.startsWith('setline-tablet='))
  if (tablet.status !== 201 || !device) throw new Error(`bad-input tablet: ${tablet.status} ${JSON.stringify(tablet.data)}`)
  cookies.device = device.split(';')[0]!
  jpeg = await jpegWithGps(32, 24)
  start = await checksums()
})
afterAll(async () => {
  await scopes?.cleanup()
  await closeTestDb()
})

// Tables the app writes in the background: the mail outbox (queue, overdue check), each job's last run, and socket.io's.
const BACKGROUND = ['knex_migrations', 'knex_migrations_lock', 'mail_outbox', 'socket_io_attachments', 'background_runs']
let tableNames: string[] = []
async function tables() {
  if (!tableNames.length) {
    tableNames = (await testDb()('pg_tables').where({ schemaname: 'public' }).whereNotIn('tablename', BACKGROUND).orderBy('tablename').pluck('tablename')) as string[]
  }
  return tableNames
}
const perTable = async (select: (t: string) => string) => {
  const ts = await tables()
  const rows: { t: string; v: string }[] = (await testDb().raw(ts.map(select).join(' UNION ALL '))).rows
  return Object.fromEntries(rows.map(r => [r.t, r.v]))
}
/** Row count and checksum of every table: the sum of a 64-bit hash of each row's text (one pass, any order). */
const checksums = () => perTable(t => `SELECT '${t}' AS t, count(*) || ' rows, ' || coalesce(sum(hashtextextended(x::text, 0)::numeric), 0) AS v FROM "${t}" x`)
/** Per route, cheaply (the checksums read every row: a register test leaves 100,000 pours): row counts. */
const counts = () => perTable(t => `SELECT '${t}' AS t, count(*) || ' rows' AS v FROM "${t}"`)

/** The route's cases, around its own-scope request: path parameters, query and body. */
function casesFor(row: RouteRow, params: Record<string, string>, baseBody: unknown, seed: number): { cases: Case[]; skipped: number } {
  const [method, template] = row.route.split(' ') as [string, string]
  const inputs = inputsOf(SOURCES.get(row.route)!)
  const pathWith = (ps: Record<string, string>) => template.replace(/\[(\w+)\]/g, (_m, p: string) => encodeURIComponent(ps[p]!))
  const baseQuery: Record<string, string | string[]> = Object.fromEntries(new URLSearchParams(row.query ?? ''))
  const cases: Case[] = []
  let skipped = 0
  const schemaOf = (where: Where) => inputs.find(i => i.where === where)?.schema

  /** What the route must answer, checking its inputs in its own order; null (not sent) for a valid write. */
  function want(values: Partial<Record<Where, unknown>>): Want | null {
    for (const { where, schema } of inputs) {
      const value = where === 'params' ? values.params ?? params : where === 'query' ? values.query ?? baseQuery : (values[where] ?? {})
      const fields = problemFields(schema!, value, where === 'params' || where === 'query' ? where : undefined)
      if (fields) return { status: 422, fields }
    }
    // every input is valid: reading is harmless, and so is a write the version check must refuse
    if (method === 'GET' || row.readOnly) return { below: 500 }
    return null
  }
  const push = (label: string, c: Omit<Case, 'label' | 'want'>, w: Want | null) => {
    // the request guard refuses a body over the route's cap before the route reads it
    if (w && c.body !== undefined && !c.type && Buffer.byteLength(c.body) > jsonBodyLimit(method, template)) w = { status: 413 }
    if (w) cases.push({ label, ...c, want: w })
    else skipped++
  }

  // bad ids in the path (a JSON body of {} if the route takes one)
  for (const p of Object.keys(params)) {
    for (const bad of BAD_IDS) {
      const ps = { ...params, [p]: bad }
      push(`path ${p}=${JSON.stringify(bad)}`, { path: pathWith(ps), body: schemaOf('body') ? '{}' : undefined }, want({ params: ps, body: {} }))
    }
  }
  // query fields
  const querySchema = schemaOf('query')
  if (querySchema) {
    const fields = [...new Set([...keysOf(querySchema), ...Object.keys(baseQuery)])]
    const mutate = (edits: [string, unknown][]) => {
      const sent = new URLSearchParams(Object.entries(baseQuery) as [string, string][])
      for (const [f, v] of edits) {
        sent.delete(f)
        if (v !== MISSING) for (const x of Array.isArray(v) && v.length ? v : [v]) sent.append(f, queryText(x))
      }
      // as the server reads it (h3's getQuery): a key given twice is a list
      const q: Record<string, string | string[]> = {}
      for (const [k, v] of sent) q[k] = k in q ? [q[k]!, v].flat() : v
      push(`query ${edits.map(([f, v]) => `${f}=${v === MISSING ? '(missing)' : queryText(v).slice(0, 40)}`).join(' ')}`, { path: pathWith(params), query: q }, want({ query: q }))
    }
    for (const f of fields) for (const v of [MISSING, '', 'abc', '-1', '1e3', 'NaN', '-1e309', HUGE, SQL[1], '0000-01-01', '2027-02-30', ['2027-01-01', '2027-01-02'], NUL, ...FAR_YEARS]) mutate([[f, v]])
    for (const edits of fc.sample(fc.uniqueArray(fc.tuple(fc.constantFrom(...fields), fc.constantFrom(...BAD)), { minLength: 1, maxLength: 3, selector: e => e[0] }), { seed, numRuns: RANDOM_CASES })) mutate(edits)
  }
  // JSON body fields, nested ones too
  const bodySchema = schemaOf('body')
  if (bodySchema) {
    const paths: Path[] = [...keysOf(bodySchema).map(k => [k]), ...leaves(baseBody).filter(p => p.length > 1)]
    const versioned = keysOf(bodySchema).includes('version') && !keysOf(bodySchema).includes('actionId')
    const mutate = (edits: [Path, unknown][]) => {
      let body = baseBody
      for (const [p, v] of edits) body = setAt(body, p, v)
      let w = want({ body: JSON.parse(toJson(body)) })
      // a valid body with a version no row has: the route must refuse it (409), so it may be sent
      if (!w && versioned && !edits.some(([p]) => p[0] === 'version')) {
        body = setAt(body, ['version'], STALE_VERSION)
        w = want({ body: JSON.parse(toJson(body)) }) ?? { status: '4xx' }
      }
      else if (!w && versioned) w = { status: '4xx' }
      push(`body ${edits.map(([p, v]) => `${p.join('.')}=${v === MISSING ? '(missing)' : toJson(v).slice(0, 40)}`).join(' ')}`, { path: pathWith(params), body: toJson(body) }, w)
    }
    for (const p of paths) {
      const leaf = p.reduce<unknown>((node, key) => (node as Record<string | number, unknown> | undefined)?.[key], baseBody)
      for (const v of sweepOf(p.length === 1 ? fieldSchema(bodySchema, String(p[0])) : undefined, leaf)) mutate([[p, v]])
    }
    const edit = fc.tuple(fc.constantFrom(...paths), fc.constantFrom(...BAD))
    for (const edits of fc.sample(fc.uniqueArray(edit, { minLength: 1, maxLength: 3, selector: e => e[0].join('.') }), { seed, numRuns: RANDOM_CASES })) mutate(edits)
    for (const text of fc.sample(fc.shuffledSubarray(MALFORMED, { minLength: MALFORMED_CASES, maxLength: MALFORMED_CASES }), { seed, numRuns: 1 })[0]!) {
      let parsed: unknown
      let malformed = false
      try {
        parsed = JSON.parse(text)
      }
      catch {
        malformed = true
      }
      push(`malformed ${JSON.stringify(text)}`, { path: pathWith(params), body: text }, malformed ? { status: 400 } : want({ body: parsed ?? {} }))
    }
    // the body as text/plain (a string) and as a form (every value a string)
    const plain = toJson(baseBody)
    // only JSON is taken (server/middleware/00.request-guard.ts): a cross-site form cannot send it
    push('text/plain body', { path: pathWith(params), body: plain, type: 'text/plain' }, { status: 415 })
    const form = new URLSearchParams(Object.entries(baseBody as Record<string, unknown>).map(([k, v]) => [k, typeof v === 'string' ? v : JSON.stringify(v)]))
    push('form-urlencoded body', { path: pathWith(params), body: form.toString(), type: 'application/x-www-form-urlencoded' }, { status: 415 })
  }
  // multipart fields of an upload (strings), with one small photo
  const fieldsSchema = schemaOf('fields')
  if (fieldsSchema) {
    for (const f of keysOf(fieldsSchema)) {
      for (const v of [...SWEEP.string!, '-1', '1e3', 'abc', 'on ', 'TRUE'].filter(v => v !== MISSING)) {
        const text = queryText(v)
        const form = photoForm([{ name: 'bad.jpg', data: jpeg }], { [f]: text })
        push(`field ${f}=${text.slice(0, 40)}`, { path: pathWith(params), form }, want({ fields: { [f]: text } }))
      }
    }
    push('no files', { path: pathWith(params), form: photoForm([], { caption: 'x' }) }, { status: 422, fields: ['files'] })
    push('JSON instead of multipart', { path: pathWith(params), body: '{"caption":"x"}' }, { status: 422, fields: ['files'] })
  }
  return { cases, skipped }
}

/** A route's own seed: adding a row does not change the cases of the others. */
function seedOf(route: string) {
  let h = SEED
  for (const ch of route) h = (Math.imul(h, 31) + ch.charCodeAt(0)) | 0
  return h
}

function check(c: Case, r: CallResult): string | null {
  const message = String(r.data?.message ?? '')
  const w = c.want
  if ('below' in w) return r.status < 500 ? null : `expected no 5xx, got ${r.status}`
  if (w.status === '4xx') return r.status >= 400 && r.status < 500 && message ? null : `expected a 4xx with a message, got ${r.status} ${message}`
  if (w.status === 400) return r.status === 400 && /JSON/.test(message) ? null : `expected 400 naming malformed JSON, got ${r.status} ${message}`
  if (w.status !== 422) return r.status === w.status && message ? null : `expected ${w.status} with a message, got ${r.status} ${message}`
  const got = [...new Set<string>((r.data?.data?.problems ?? []).map((p: { field: string }) => p.field))].sort()
  if (r.status !== 422) return `expected 422 naming ${w.fields.join(', ')}, got ${r.status} ${message.slice(0, 200)}`
  return JSON.stringify(got) === JSON.stringify(w.fields) ? null : `expected 422 naming ${w.fields.join(', ')}, named ${got.join(', ')}`
}

describe('bad input', () => {
  it('every route validates with shared schemas only', () => {
    const missing = routesOnDisk().flatMap(r => inputsOf(r.source).filter(i => !i.schema).map(i => `${r.route}: ${i.name}`))
    expect(missing).toEqual([])
  })

  const withInput = ROUTES.filter(row => inputsOf(SOURCES.get(row.route) ?? '').length)
  for (const row of withInput) {
    it(`${row.route}: 4xx naming the problem, never 5xx, no row added or removed`, async () => {
      // the own scope's standing rows: nothing fresh is made, so nothing the cases could use up
      const own = scopes.request('own', false)
      const params: Record<string, string> = { ...row.params }
      for (const [p, kind] of Object.entries(row.ids ?? {})) params[p] = String(await own.id(kind))
      const baseBody = row.valid ?? (row.body ? await row.body(own) : {})
      const { cases, skipped } = casesFor(row, params, baseBody, seedOf(row.route))
      const caller = row.device ? cookies.device : row.roles === 'public' ? undefined : cookies[row.roles.includes('lead') ? 'lead' : row.roles[0]!]
      const method = row.route.split(' ')[0]!
      const before = await counts()
      const limit = pLimit(4)
      const failures = (await Promise.all(cases.map(c => limit(async () => {
        const q = c.query ? `?${new URLSearchParams(Object.entries(c.query).flatMap(([k, v]) => (Array.isArray(v) ? v.map(x => [k, x]) : [[k, v]])))}` : ''
        const r = await call(c.path + q, { method, cookie: caller, form: c.form, rawBody: c.body, contentType: c.type })
        const problem = check(c, r)
        return problem && `${c.label}: ${problem}`
      })))).filter(Boolean)
      const after = await counts()
      const changed = Object.keys(before).filter(t => before[t] !== after[t]).map(t => `${t}: ${before[t]} → ${after[t]}`)
      expect({ failures, changed }).toEqual({ failures: [], changed: [] })
      expect(cases.length, `${skipped} valid writes skipped`).toBeGreaterThan(0)
    })
  }

  // the checksums also catch an update, which the per-route counts cannot
  it('leaves every table as it was: row counts and checksums before and after all of it', async () => {
    const end = await checksums()
    expect(Object.keys(start).filter(t => start[t] !== end[t]).map(t => `${t}: ${start[t]} → ${end[t]}`)).toEqual([])
  })
})

// ---- writes from another site, as a form, or too large ----
// Every write route (POST, PUT, PATCH, DELETE) as a cross-site form would send it, from a
// foreign Origin, and with a JSON body over its cap: refused before the route runs (415, 403,
// 413 from server/middleware/00.request-guard.ts), never a 500, nothing written.
describe('writes from another site, as a form, or too large', () => {
  const writes = ROUTES.filter(row => row.route.split(' ')[0] !== 'GET')
  for (const row of writes) {
    it(`${row.route}: urlencoded 415, foreign Origin 403, oversized 413, nothing written`, async () => {
      const [method, template] = row.route.split(' ') as [string, string]
      const own = scopes.request('own', false)
      const params: Record<string, string> = { ...row.params }
      for (const [p, kind] of Object.entries(row.ids ?? {})) params[p] = String(await own.id(kind))
      const path = template.replace(/\[(\w+)\]/g, (_m, p: string) => encodeURIComponent(params[p]!))
      const body = row.valid ?? (row.body ? await row.body(own) : {})
      const caller = row.device ? cookies.device : row.roles === 'public' ? undefined : cookies[row.roles.includes('lead') ? 'lead' : row.roles[0]!]
      const headers = (extra: Record<string, string>) => ({ accept: 'application/json', ...(caller ? { cookie: caller } : {}), ...extra })
      const before = await counts()
      const form = new URLSearchParams(Object.entries(body as Record<string, unknown>).map(([k, v]) => [k, typeof v === 'string' ? v : JSON.stringify(v)]))
      const asForm = await fetch(baseUrl() + path, { method, headers: headers({ 'content-type': 'application/x-www-form-urlencoded' }), body: form.toString() || 'a=1' })
      const foreign = await fetch(baseUrl() + path, { method, headers: headers({ 'content-type': 'application/json', 'origin': 'http://attacker.example.test' }), body: JSON.stringify(body) })
      const padding = 'x'.repeat(jsonBodyLimit(method, template) + 1)
      const oversized = await fetch(baseUrl() + path, { method, headers: headers({ 'content-type': 'application/json' }), body: JSON.stringify({ ...(body as object), padding }) })
      const after = await counts()
      expect({
        statuses: [asForm.status, foreign.status, oversized.status],
        changed: Object.keys(before).filter(t => before[t] !== after[t]),
      }).toEqual({ statuses: [415, 403, 413], changed: [] })
    })
  }
})
