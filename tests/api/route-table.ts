// THE ROUTE TABLE: one row per file under server/api (access.test.ts fails when a file has no
// row). Two tests are generated from it:
// - access.test.ts, the access matrix: every route × caller (signed out, lead, caster,
//   finisher, client) × scope (own: the demo workshop's rows; other: a second workshop's rows;
//   otherClient: a job of the other client organisation). The expected answer of every cell is
//   worked out from the row by `expected()` below and fails on any leak or unexpected refusal.
// - bad-input.test.ts: wrong types, missing fields, huge strings, odd numbers, unknown enum
//   values, malformed JSON, SQL-looking text and bad ids for the route's body, query and path,
//   with field names from the shared zod schema the route file validates with.
//
// A row, on one line:
//   { route: 'PATCH /api/jobs/[id]', roles: LEAD, ids: { id: 'job' }, body: async s => ({ site: 'x', version: await s.version('job') }) },
// route        METHOD and path exactly as the file: server/api/jobs/[id].patch.ts → 'PATCH /api/jobs/[id]'
// roles        who succeeds on the own scope's rows, or 'public' (no requireRole)
// guard        who passes requireRole when that is wider than `roles` (the service refuses the rest with 403)
// ids          path parameters filled with the scope's row of a kind (tests/setup/scopes.ts: job, mould,
//              newPour…); `new…` kinds are a fresh row for each call that should succeed
// params       path parameters that are not rows (a day, a photo variant)
// query        the query string, without '?'
// body / form  the JSON body (or multipart form) for a scope `s`: `await s.id(kind)` for a row's id,
//              `await s.version(kind)` for its version. The own scope's body must succeed for `roles`;
//              the same body, with the other scope's ids, is what another workshop sends.
// other        what an allowed caller gets for the other workshop's rows. Default: 404 when the path
//              names a row, 422 when only the body does; a route that names no row is checked for
//              leaks instead (the own answer must not show the other workshop's rows).
// otherClient  what the client gets for the other client's job (default 404; staff see every job)
// public       what every caller gets from a public route with this request (default 2xx)
// valid        bad-input only: a body that passes the schema, to mutate, when `body` is not one
// readOnly     bad-input only: a POST that writes nothing, so schema-valid extremes may be sent
// device       bad-input only: send a shared tablet's device cookie (the route answers to it, not to a session)
// endsSession  a successful call ends the caller's session on the server (sign-out, a device becoming a
//              shared tablet): the access test sends it with a session signed in for that call alone
import { randomUUID } from 'node:crypto'
import { readdirSync, readFileSync, statSync } from 'node:fs'
import { join, relative } from 'node:path'
import type { Kind, Scope } from '../setup/scopes'
import { DEMO_PASSWORD, demoWorkshopId, testDb } from '../setup/fixtures'
import { jpegWithGps, photoForm } from '../setup/photo-fixtures'
import { plasterGradeFromPreset } from '#shared/utils/plaster'

export type Role = 'lead' | 'caster' | 'finisher' | 'client'
/** A cell's answer: 'ok' is any 2xx, a number that status. */
export type Outcome = 'ok' | number

export interface RouteRow {
  route: string
  roles: Role[] | 'public'
  guard?: Role[]
  ids?: Record<string, Kind>
  params?: Record<string, string>
  query?: string
  body?: (s: Scope) => unknown
  form?: (s: Scope) => Promise<FormData> | FormData
  other?: Outcome
  otherClient?: Outcome
  public?: Outcome
  valid?: Record<string, unknown>
  readOnly?: boolean
  device?: boolean
  endsSession?: boolean
}

const LEAD: Role[] = ['lead']
const STAFF: Role[] = ['lead', 'caster', 'finisher']
const EVERYONE: Role[] = ['lead', 'caster', 'finisher', 'client']
const rnd = () => randomUUID().slice(0, 8)
/** A well-formed link token no invitation or reset has. */
const NO_TOKEN = 'matrix-token-that-was-never-issued-00000'
/** A signature as the pad sends it: a real PNG (one pixel) as a data URL. */
const MATRIX_SIGNATURE = 'data:image/png;base64,iVBORw0KGgoAAAANSUhEUgAAAAEAAAABCAYAAAAfFcSJAAAADUlEQVR42mNkYPhfDwAChwGA60e6kgAAAABJRU5ErkJggg=='
const GRADE = (({ label: _l, ...g }) => g)(plasterGradeFromPreset('beta-fibrous'))
const MIX = { consistency: 70, wastePct: 0, waterTempC: 20, powderTempC: 20, shopTempC: 20, setFactor: 1 }
/** The demo workshop's settings as the settings page sends them back. */
const RATES = {
  currency: 'GBP', plasterPerBag: 1850, mouldPerProfile: 42000, castPerLength: 3500, castPerPiece: 2800,
  fettlePerPiece: 900, fixPerMetre: 1250, deliveryPerTrip: 6000, marginPct: 15, taxPct: 20, depositPct: 30,
}
const TAKE_OFF = { rooms: [{ name: 'Hall', runs: [], ornaments: [{ name: 'Corbel', count: 4, plasterKgEach: 3.5, newMould: true }] }], bagKg: 25, deliveries: 1, fixing: false }
/** The demo workshop's rates version (1 until the first save writes its row). */
async function ratesVersion() {
  const row = await testDb()('workshop_rates').where({ workshop_id: await demoWorkshopId() }).first('version')
  return row ? Number(row.version) : 1
}
async function settings() {
  const w = await testDb()('workshops').where({ id: await demoWorkshopId() }).first()
  return { version: w.version, name: w.name, units: w.units, timezone: w.timezone, shiftStart: w.shift_start.slice(0, 5), shiftEnd: w.shift_end.slice(0, 5), workingDays: w.working_days.map(Number), defaultShopTempC: Number(w.default_shop_temp_c), defaultHumidityPct: Number(w.default_humidity_pct) }
}
/** A one-mould CSV import with a fresh code. */
function mouldCsv() {
  const f = new FormData()
  f.append('file', new Blob([`code,casts,material,cavity (L)\nMX-${rnd()},Matrix,silicone,1.5\n`], { type: 'text/csv' }), 'moulds.csv')
  return f
}
const photo = async () => photoForm([{ name: 'matrix.jpg', data: await jpegWithGps(64, 48) }])

export const ROUTES: RouteRow[] = [
  { route: 'GET /api/health', roles: 'public' },
  { route: 'GET /api/ready', roles: 'public' },
  // the first-run set-up is gone once a workshop exists (tests/api/setup.test.ts covers it open)
  { route: 'GET /api/setup', roles: 'public', public: 404 },
  { route: 'POST /api/setup', roles: 'public', body: () => ({ code: 'ABCD-EFGH-JKMN', name: 'Matrix', units: 'metric', timezone: 'Europe/London', shiftStart: '07:00', shiftEnd: '15:00', workingDays: [1, 2, 3], defaultShopTempC: 18, defaultHumidityPct: 50, leadName: 'Matrix', leadEmail: 'setup@matrix.example.test', leadPassword: 'matrix-password-1' }), public: 404 },
  { route: 'POST /api/auth/login', roles: 'public', body: () => ({}), public: 422, valid: { email: 'nobody@matrix.example.test', password: 'not-the-password' } },
  { route: 'POST /api/auth/logout', roles: 'public', endsSession: true },
  { route: 'GET /api/auth/invitation', roles: 'public', query: `token=${NO_TOKEN}`, public: 410 },
  // the two below hash the password before they look at the token (slow): the matrix sends an empty body
  { route: 'POST /api/auth/invitation', roles: 'public', body: () => ({}), public: 422, valid: { token: NO_TOKEN, name: 'Matrix', password: 'matrix-password-1' } },
  { route: 'POST /api/auth/password-reset', roles: 'public', body: () => ({}), public: 422, valid: { email: 'nobody@matrix.example.test' } },
  { route: 'POST /api/auth/password-reset/confirm', roles: 'public', body: () => ({}), public: 422, valid: { token: NO_TOKEN, password: 'matrix-password-1' } },
  { route: 'GET /api/auth/me', roles: EVERYONE },
  { route: 'GET /api/users', roles: LEAD },
  { route: 'PATCH /api/users/[id]', roles: LEAD, ids: { id: 'user' }, body: () => ({ disabled: false }) },
  { route: 'PUT /api/users/[id]/hours', roles: LEAD, ids: { id: 'user' }, body: () => ({ workingDays: [1, 2, 3, 4], shiftStart: '08:00', shiftEnd: '15:00', maxMixes: 1, absences: [{ fromDay: '2027-02-01', toDay: '2027-02-03', reason: 'Leave' }] }) },
  { route: 'GET /api/calendar', roles: LEAD },
  { route: 'PUT /api/calendar/closures', roles: LEAD, body: () => ({ closures: [{ fromDay: '2027-12-24', toDay: '2027-12-27', reason: 'Christmas' }] }) },
  { route: 'GET /api/invitations', roles: LEAD },
  { route: 'POST /api/invitations', roles: LEAD, body: () => ({ email: `invite-${rnd()}@matrix.example.test`, role: 'caster' }) },
  { route: 'GET /api/dev/mails', roles: LEAD },
  { route: 'POST /api/dev/mails/refuse', roles: LEAD, body: () => ({ count: 0 }) },
  { route: 'GET /api/me/notifications', roles: EVERYONE },
  { route: 'PATCH /api/me/notifications', roles: EVERYONE, body: () => ({ job_ready: true }) },
  { route: 'GET /api/quality', roles: LEAD, query: 'from=2027-09-01&to=2027-09-30' },
  { route: 'GET /api/overview', roles: LEAD },
  { route: 'GET /api/client/jobs', roles: ['client'] },
  { route: 'GET /api/workshop', roles: LEAD },
  { route: 'PATCH /api/workshop', roles: LEAD, body: settings },
  { route: 'GET /api/calc/options', roles: STAFF },
  { route: 'POST /api/calc/mix', roles: EVERYONE, body: async s => ({ ...MIX, gradeId: await s.id('grade'), mouldId: await s.id('mould') }), readOnly: true },
  { route: 'GET /api/board', roles: STAFF, query: 'from=2027-09-13&to=2027-09-13' },
  { route: 'POST /api/pours', roles: LEAD, body: async s => ({ mouldId: await s.id('newMould'), slotStart: '2027-09-14T09:00:00Z' }) },
  { route: 'PATCH /api/pours/[id]', roles: LEAD, ids: { id: 'newPour' }, body: () => ({ version: 1, slotStart: '2027-09-13T11:00:00Z' }) },
  { route: 'POST /api/pours/[id]/actions', roles: ['lead', 'caster'], ids: { id: 'newPour' }, body: () => ({ actionId: randomUUID(), kind: 'start_mixing', version: 1, waterTempC: 18 }) },
  { route: 'POST /api/pours/[id]/void', roles: LEAD, ids: { id: 'newPour' }, body: () => ({ version: 1, reason: 'matrix' }) },
  { route: 'GET /api/floor/today', roles: ['lead', 'caster'] },
  // finishing and dispatch
  { route: 'POST /api/pieces/[id]/actions', roles: ['lead', 'finisher'], ids: { id: 'newPiece' }, body: async s => ({ actionId: randomUUID(), kind: 'fettled', version: await s.version('newPiece') }) },
  { route: 'GET /api/finishing', roles: ['lead', 'finisher'] },
  { route: 'POST /api/jobs/[id]/dispatches', roles: LEAD, ids: { id: 'job' }, body: async s => ({ actionId: randomUUID(), pieceIds: [await s.id('newPackedPiece')] }) },
  { route: 'GET /api/jobs/[id]/dispatches', roles: ['lead', 'finisher'], ids: { id: 'job' } },
  { route: 'GET /api/dispatches/[id]', roles: ['lead', 'finisher'], ids: { id: 'dispatch' } },
  { route: 'GET /api/dispatches/[id]/invoice-lines', roles: LEAD, ids: { id: 'dispatch' } },
  // the piece page, labels and scans
  { route: 'GET /api/pieces/[id]', roles: STAFF, ids: { id: 'piece' } },
  { route: 'GET /api/pieces/[id]/label', roles: STAFF, ids: { id: 'piece' } },
  { route: 'POST /api/pieces/[id]/label/revoke', roles: LEAD, ids: { id: 'newPiece' } },
  { route: 'GET /api/jobs/[id]/labels', roles: STAFF, ids: { id: 'job' } },
  { route: 'GET /api/labels/[token]', roles: STAFF, ids: { token: 'label' } },
  // crates, deliveries, proof of delivery, calendar feeds
  { route: 'GET /api/jobs/[id]/crates', roles: ['lead', 'finisher'], ids: { id: 'job' } },
  { route: 'POST /api/jobs/[id]/crates', roles: ['lead', 'finisher'], ids: { id: 'job' }, body: async s => ({ pieceIds: [await s.id('newPackedPiece')] }) },
  { route: 'GET /api/crates/[id]', roles: ['lead', 'finisher'], ids: { id: 'crate' } },
  { route: 'POST /api/crates/[id]/pieces', roles: ['lead', 'finisher'], ids: { id: 'crate' }, body: async s => ({ pieceIds: [await s.id('newPackedPiece')] }) },
  { route: 'GET /api/jobs/[id]/deliveries', roles: ['lead', 'finisher'], ids: { id: 'job' } },
  { route: 'POST /api/jobs/[id]/deliveries', roles: LEAD, ids: { id: 'job' }, body: async s => ({ deliveryDay: '2027-09-21', vehicle: 'Matrix van', pieceIds: [await s.id('newPackedPiece')] }) },
  { route: 'GET /api/deliveries/[id]', roles: ['lead', 'finisher'], ids: { id: 'delivery' } },
  { route: 'GET /api/deliveries/[id]/note', roles: ['lead', 'finisher'], ids: { id: 'delivery' } },
  { route: 'POST /api/deliveries/[id]/proof', roles: ['lead', 'finisher'], ids: { id: 'newDelivery' }, body: () => ({ actionId: randomUUID(), receiverName: 'Matrix receiver', signature: MATRIX_SIGNATURE }) },
  { route: 'GET /api/client/jobs/[id]/deliveries', roles: ['client'], ids: { id: 'job' } },
  { route: 'GET /api/client/deliveries/[id]/note', roles: ['client'], ids: { id: 'delivery' } },
  { route: 'GET /api/jobs/[id]/fixers-pack', roles: ['lead', 'finisher'], ids: { id: 'job' } },
  { route: 'GET /api/feeds', roles: LEAD },
  { route: 'POST /api/feeds', roles: LEAD, body: async s => ({ jobId: await s.id('job') }) },
  { route: 'DELETE /api/feeds/[id]', roles: LEAD, ids: { id: 'feed' } },
  { route: 'GET /api/ics/[token]', roles: 'public', params: { token: `${NO_TOKEN.replace(/-/g, '_')}.ics` }, public: 404 },
  // shared tablets and PINs; the tablet's own two routes answer to its device cookie, not a session (tests/api/tablet.test.ts)
  { route: 'GET /api/tablets', roles: LEAD },
  { route: 'POST /api/tablets', roles: LEAD, body: () => ({ name: `Matrix tablet ${rnd()}` }), endsSession: true },
  { route: 'POST /api/tablets/[id]/revoke', roles: LEAD, ids: { id: 'newTablet' } },
  { route: 'GET /api/me/pin', roles: ['caster', 'finisher'] },
  { route: 'PUT /api/me/pin', roles: ['caster', 'finisher'], body: () => ({ pin: '2719', password: DEMO_PASSWORD }) },
  { route: 'DELETE /api/me/pin', roles: ['caster', 'finisher'] },
  { route: 'DELETE /api/users/[id]/pin', roles: LEAD, ids: { id: 'user' } },
  { route: 'GET /api/tablet/people', roles: 'public', public: 401 },
  { route: 'POST /api/tablet/switch', roles: 'public', body: () => ({}), public: 401, valid: { userId: 1, pin: '2719' }, device: true },
  { route: 'GET /api/shop-days', roles: STAFF, query: 'from=2027-09-13&to=2027-09-14' },
  { route: 'PUT /api/shop-days/[day]', roles: LEAD, params: { day: '2027-09-15' }, body: () => ({ tempC: 18, humidityPct: 50 }) },
  { route: 'POST /api/planner/preview', roles: LEAD, body: () => ({ from: '2027-09-20', to: '2027-09-21' }), readOnly: true },
  { route: 'POST /api/planner/accept', roles: LEAD, body: async s => ({ from: '2027-09-16', to: '2027-09-16', pours: [{ jobItemId: await s.id('newItem'), mouldId: await s.id('newMould'), slotStart: '2027-09-16T09:00:00Z' }] }) },
  { route: 'GET /api/day-sheet', roles: ['lead', 'caster'], query: 'day=2027-09-13' },
  { route: 'GET /api/day-sheet/export', roles: ['lead', 'caster'], query: 'day=2027-09-13' },
  { route: 'GET /api/grades', roles: STAFF },
  { route: 'POST /api/grades', roles: LEAD, body: () => ({ name: `Matrix grade ${rnd()}`, bagKg: 25, grade: GRADE }) },
  { route: 'PATCH /api/grades/[id]', roles: LEAD, ids: { id: 'grade' }, body: async s => ({ notes: 'matrix', version: await s.version('grade') }) },
  { route: 'POST /api/grades/[id]/calibration', roles: LEAD, ids: { id: 'grade' }, body: async s => ({ apply: false, version: await s.version('grade') }) },
  // rates and quotes: the office's, lead only
  { route: 'GET /api/rates', roles: LEAD },
  { route: 'PUT /api/rates', roles: LEAD, body: async () => ({ ...RATES, version: await ratesVersion() }) },
  { route: 'GET /api/quotes', roles: LEAD },
  { route: 'POST /api/quotes', roles: LEAD, body: () => ({ title: `Matrix quote ${rnd()}`, takeOff: TAKE_OFF }) },
  { route: 'GET /api/quotes/[id]', roles: LEAD, ids: { id: 'quote' } },
  { route: 'GET /api/quotes/[id]/pdf', roles: LEAD, ids: { id: 'quote' } },
  { route: 'PATCH /api/quotes/[id]', roles: LEAD, ids: { id: 'newQuote' }, body: async s => ({ takeOff: TAKE_OFF, version: await s.version('newQuote') }) },
  { route: 'POST /api/quotes/[id]/send', roles: LEAD, ids: { id: 'newQuote' }, body: async s => ({ version: await s.version('newQuote') }) },
  { route: 'POST /api/quotes/[id]/revise', roles: LEAD, ids: { id: 'newSentQuote' }, body: async s => ({ version: await s.version('newSentQuote') }) },
  { route: 'POST /api/quotes/[id]/job', roles: LEAD, ids: { id: 'newAcceptedQuote' }, body: () => ({ jobCode: `QJ-${rnd()}`, newSite: { name: `Matrix site ${rnd()}`, address: '1 Example Row' } }) },
  { route: 'GET /api/client/quotes', roles: ['client'] },
  { route: 'GET /api/client/quotes/[id]', roles: ['client'], ids: { id: 'sentQuote' } },
  { route: 'GET /api/client/quotes/[id]/pdf', roles: ['client'], ids: { id: 'sentQuote' } },
  { route: 'POST /api/client/quotes/[id]/decision', roles: ['client'], ids: { id: 'newSentQuote' }, body: () => ({ revision: 1, decision: 'accept' }) },
  // deposits and payments
  { route: 'GET /api/jobs/[id]/payments', roles: LEAD, ids: { id: 'job' } },
  { route: 'POST /api/jobs/[id]/payments', roles: LEAD, ids: { id: 'job' }, body: () => ({ amount: 1250, method: 'bank_transfer', paidOn: '2026-12-01' }) },
  { route: 'PUT /api/jobs/[id]/deposit', roles: LEAD, ids: { id: 'depositJob' }, body: () => ({ depositMinor: 5000 }) },
  { route: 'POST /api/payments/[id]/refund', roles: LEAD, ids: { id: 'newPayment' } },
  { route: 'GET /api/client/jobs/[id]/deposit', roles: ['client'], ids: { id: 'depositJob' } },
  { route: 'POST /api/client/jobs/[id]/deposit-checkout', roles: ['client'], ids: { id: 'depositJob' } },
  // invoices: the lead issues and voids; the client reads their own jobs' invoices
  { route: 'POST /api/jobs/[id]/invoices', roles: LEAD, ids: { id: 'job' }, body: () => ({ stage: `Matrix stage ${rnd()}`, lines: [{ description: 'Cornice lengths', quantity: 2, unitPrice: 4025 }] }) },
  { route: 'GET /api/invoices', roles: LEAD },
  { route: 'GET /api/invoices/export', roles: LEAD },
  { route: 'GET /api/invoices/[id]', roles: LEAD, ids: { id: 'invoice' } },
  { route: 'GET /api/invoices/[id]/pdf', roles: LEAD, ids: { id: 'invoice' } },
  { route: 'POST /api/invoices/[id]/void', roles: LEAD, ids: { id: 'newInvoice' }, body: () => ({ reason: 'Issued to the wrong stage' }) },
  { route: 'GET /api/client/invoices', roles: ['client'] },
  { route: 'GET /api/client/invoices/[id]/pdf', roles: ['client'], ids: { id: 'invoice' } },
  { route: 'POST /api/payments/webhook', roles: 'public', body: () => ({ id: 'evt_matrix', type: 'checkout.session.completed' }), public: 400 },
  { route: 'GET /api/lots', roles: STAFF },
  { route: 'POST /api/lots', roles: LEAD, body: async s => ({ gradeId: await s.id('grade'), lotCode: `MX-${rnd()}`, bagsReceived: 2, bagKg: 25, receivedOn: '2026-12-01' }) },
  { route: 'PATCH /api/lots/[id]', roles: LEAD, ids: { id: 'lot' }, body: async s => ({ notes: 'matrix', version: await s.version('lot') }) },
  { route: 'GET /api/lots/export', roles: LEAD },
  { route: 'GET /api/consumables', roles: STAFF },
  { route: 'POST /api/consumables', roles: LEAD, body: () => ({ name: `Laths ${rnd()}`, unit: 'each', kgPerUnit: 0.25 }) },
  { route: 'PATCH /api/consumables/[id]', roles: LEAD, ids: { id: 'consumable' }, body: async s => ({ kgPerUnit: 0.3, version: await s.version('consumable') }) },
  { route: 'POST /api/consumables/[id]/receive', roles: LEAD, ids: { id: 'consumable' }, body: () => ({ quantity: 12.5, note: 'matrix' }) },
  { route: 'GET /api/benches', roles: STAFF },
  { route: 'POST /api/benches', roles: LEAD, body: () => ({ name: `Matrix ${rnd()}`, kind: 'casting', sortOrder: 96 }) },
  { route: 'PATCH /api/benches/[id]', roles: LEAD, ids: { id: 'bench' }, body: async s => ({ kind: 'flat casting', version: await s.version('bench') }) },
  { route: 'GET /api/moulds', roles: STAFF },
  { route: 'POST /api/moulds', roles: LEAD, body: async s => ({ code: `MX-${rnd()}`, casts: 'Matrix', material: 'silicone', benchId: await s.id('bench'), cavityLitres: 1, prepMinutes: 5, cleanMinutes: 5, maxDwellMinutes: 60, pulls: 0 }) },
  { route: 'GET /api/moulds/[id]', roles: STAFF, ids: { id: 'mould' } },
  { route: 'PATCH /api/moulds/[id]', roles: LEAD, ids: { id: 'mould' }, body: async s => ({ casts: 'Matrix edit', version: await s.version('mould') }) },
  { route: 'GET /api/moulds/[id]/work', roles: STAFF, ids: { id: 'mould' } },
  { route: 'PUT /api/moulds/[id]/work', roles: LEAD, ids: { id: 'mould' }, body: () => ({ kind: 'repair', stages: [], startedOn: '2027-03-01', availableFrom: '2027-03-10' }) },
  { route: 'POST /api/moulds/[id]/state', roles: LEAD, ids: { id: 'mould' }, body: async s => ({ state: 'cleaning', version: await s.version('mould') }) },
  { route: 'GET /api/moulds/export', roles: LEAD },
  { route: 'GET /api/profiles', roles: STAFF },
  { route: 'POST /api/profiles', roles: LEAD, body: () => ({ name: `Profile ${rnd()}` }) },
  { route: 'GET /api/import/[kind]/template', roles: LEAD, params: { kind: 'moulds' } },
  { route: 'GET /api/import/[kind]/export', roles: LEAD, params: { kind: 'clients' } },
  { route: 'POST /api/import/[kind]/preview', roles: LEAD, params: { kind: 'moulds' }, form: () => mouldCsv() },
  { route: 'POST /api/import/[kind]/confirm', roles: LEAD, params: { kind: 'moulds' }, form: () => mouldCsv() },
  { route: 'GET /api/clients', roles: LEAD },
  { route: 'POST /api/clients', roles: LEAD, body: () => ({ name: `Matrix client ${rnd()}`, notes: 'Matrix' }) },
  { route: 'GET /api/clients/[id]', roles: LEAD, ids: { id: 'clientOrg' } },
  { route: 'PATCH /api/clients/[id]', roles: LEAD, ids: { id: 'clientOrg' }, body: async s => ({ notes: 'Matrix notes', version: await s.version('clientOrg') }) },
  { route: 'POST /api/clients/[id]/contacts', roles: LEAD, ids: { id: 'clientOrg' }, body: () => ({ name: 'Matrix contact', email: `mx-${rnd()}@contact.example.test`, mailSamples: false }) },
  { route: 'POST /api/clients/[id]/sites', roles: LEAD, ids: { id: 'clientOrg' }, body: () => ({ name: `Matrix site ${rnd()}`, address: '2 Matrix Road', postcode: 'EX9 9ZZ' }) },
  { route: 'PATCH /api/contacts/[id]', roles: LEAD, ids: { id: 'contact' }, body: async s => ({ mailProgress: false, version: await s.version('contact') }) },
  { route: 'DELETE /api/contacts/[id]', roles: LEAD, ids: { id: 'newContact' } },
  { route: 'GET /api/sites', roles: LEAD },
  { route: 'PATCH /api/sites/[id]', roles: LEAD, ids: { id: 'site' }, body: async s => ({ parking: 'Matrix parking', version: await s.version('site') }) },
  { route: 'GET /api/jobs', roles: STAFF },
  { route: 'POST /api/jobs', roles: LEAD, body: () => ({ code: `MX-${rnd()}`, title: 'Matrix job' }) },
  { route: 'GET /api/jobs/[id]', roles: STAFF, ids: { id: 'job' } },
  { route: 'GET /api/client/jobs/[id]', roles: ['client'], ids: { id: 'job' } },
  { route: 'PATCH /api/jobs/[id]', roles: LEAD, ids: { id: 'job' }, body: async s => ({ site: 'Matrix site', version: await s.version('job') }) },
  { route: 'POST /api/jobs/[id]/items', roles: LEAD, ids: { id: 'job' }, body: () => ({ kind: 'pieces', profile: 'Matrix', description: 'Matrix item', quantity: 2 }) },
  { route: 'PATCH /api/jobs/[id]/items/[itemId]', roles: LEAD, ids: { id: 'job', itemId: 'item' }, body: async s => ({ kind: 'pieces', profile: 'Matrix', description: 'Matrix item', quantity: 3, version: await s.version('item') }) },
  { route: 'DELETE /api/jobs/[id]/items/[itemId]', roles: LEAD, ids: { id: 'job', itemId: 'newItem' } },
  { route: 'POST /api/jobs/[id]/members', roles: LEAD, ids: { id: 'job' }, body: s => ({ email: s.clientEmail }) },
  { route: 'DELETE /api/jobs/[id]/members/[userId]', roles: LEAD, ids: { id: 'job', userId: 'newMember' } },
  { route: 'POST /api/jobs/[id]/sample', roles: LEAD, ids: { id: 'sampleJob' }, body: async s => ({ state: 'awaiting_approval', version: await s.version('sampleJob') }) },
  { route: 'POST /api/jobs/[id]/sample-decision', roles: ['client'], ids: { id: 'decisionJob' }, body: () => ({ decision: 'approved' }) },
  { route: 'GET /api/jobs/[id]/export', roles: LEAD, ids: { id: 'job' } },
  { route: 'GET /api/jobs/[id]/cost', roles: LEAD, ids: { id: 'job' } },
  { route: 'GET /api/jobs/[id]/photos', roles: STAFF, ids: { id: 'job' } },
  { route: 'GET /api/client/jobs/[id]/photos', roles: ['client'], ids: { id: 'job' } },
  { route: 'POST /api/jobs/[id]/photos', roles: STAFF, ids: { id: 'job' }, form: photo },
  { route: 'PATCH /api/photos/[id]', roles: STAFF, ids: { id: 'photo' }, body: () => ({ caption: 'Matrix caption' }) },
  // the uploader or a lead: the photo is the lead's, so other staff pass requireRole and are refused after
  { route: 'DELETE /api/photos/[id]', roles: LEAD, guard: STAFF, ids: { id: 'newPhoto' } },
  { route: 'GET /api/photos/[id]/[variant]', roles: EVERYONE, ids: { id: 'photo' }, params: { variant: 'thumb' } },
  { route: 'GET /api/client/jobs/[id]/progress', roles: ['client'], ids: { id: 'job' } },
  { route: 'GET /api/jobs/[id]/register', roles: LEAD, ids: { id: 'job' } },
  { route: 'GET /api/jobs/[id]/register/export', roles: LEAD, ids: { id: 'job' } },
]

export type Caller = Role | 'anon'
export const CALLERS: Caller[] = ['anon', 'lead', 'caster', 'finisher', 'client']

/**
 * One cell's expected answer. 'same' and 'no-leak' cells send nothing of their own: the route
 * names no row that differs in that scope, so the own answer stands for it ('no-leak': and must
 * not show the scope's rows). `differs` tells whether the request names other rows in the scope.
 */
export function expected(row: RouteRow, caller: Caller, scope: 'own' | 'other' | 'otherClient', differs: boolean): Outcome | 'same' | 'no-leak' {
  if (scope !== 'own' && !differs) {
    if (row.roles === 'public' || caller === 'anon') return 'same'
    if (scope === 'other') return 'no-leak'
    return caller === 'client' ? 'no-leak' : 'same'
  }
  if (row.roles === 'public') return row.public ?? 'ok'
  if (caller === 'anon') return 401
  if (!(row.guard ?? row.roles).includes(caller)) return 403
  if (scope === 'other') return row.other ?? (row.ids && Object.keys(row.ids).length ? 404 : 422)
  if (scope === 'otherClient' && caller === 'client') return row.otherClient ?? 404
  return row.roles.includes(caller) ? 'ok' : 403
}

const API_DIR = join(import.meta.dirname, '../../server/api')

function filesUnder(dir: string): string[] {
  return readdirSync(dir).flatMap((f) => {
    const p = join(dir, f)
    return statSync(p).isDirectory() ? filesUnder(p) : [p]
  })
}

/** Every route file under server/api as its route ('PATCH /api/jobs/[id]') and its source. */
export function routesOnDisk() {
  return filesUnder(API_DIR).map((file) => {
    const rel = relative(API_DIR, file).replace(/\.ts$/, '')
    const m = rel.match(/^(.*)\.(get|post|patch|put|delete)$/)
    if (!m) throw new Error(`route file without a method suffix: ${rel}`)
    const path = ('/api/' + m[1]!.replace(/(^|\/)index$/, '')).replace(/\/$/, '')
    return { route: `${m[2]!.toUpperCase()} ${path}`, source: readFileSync(file, 'utf8') }
  })
}
