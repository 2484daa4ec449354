// The invented demo workshop: a lead, two casters, a finisher, two clients in two client
// organisations, benches, moulds, plaster grades and lots, and three jobs at different
// stages. Every name and address is made up (example.test). Dates are relative to today.
import type { Knex } from 'knex'
import { DateTime } from 'luxon'
import { Hash } from '@adonisjs/hash'
import { Scrypt } from '@adonisjs/hash/drivers/scrypt'
import { scryptOptions } from '../../server/utils/password-policy'
import { GRADE_PRESETS, batchForCavity, castFromBatch, demouldWindow } from '#shared/utils/plaster'
import { finishingDryBy } from '#shared/utils/finishing'
import { mouldCastFromRow, pieceMasses, pourLitres, shellLitres, suggestedScrimM2 } from '#shared/utils/plaster-fibrous'
import { DEMO_PASSWORD, DEMO_USERS } from './demo-people'

const TZ = 'Europe/London'
/** The demo's fibrous ceiling centre: its face and shell (its cavity is the shell, as the mould form stores it). */
const CC210_SHELL = { surface_area_m2: 0.42, shell_thickness_mm: 10 }
type Ids = Record<string, number>

function localDay(offsetDays: number, hour: number, minute = 0) {
  return DateTime.now().setZone(TZ).startOf('day').plus({ days: offsetDays }).set({ hour, minute }).toJSDate()
}
const isoDay = (offsetDays: number) => localDay(offsetDays, 12).toISOString().slice(0, 10)

async function insertId(k: Knex, table: string, row: Record<string, unknown>) {
  const [r] = await k(table).insert(row).returning('id')
  return Number(r.id)
}

async function seedPeople(k: Knex, workshopId: number) {
  const hasher = new Hash(new Scrypt(scryptOptions()))
  const hash = await hasher.make(DEMO_PASSWORD)
  const orgs: Ids = {}
  const users: Ids = {}
  for (const u of DEMO_USERS) {
    const org = 'org' in u ? u.org : undefined
    if (org && !orgs[org]) orgs[org] = await insertId(k, 'client_orgs', { workshop_id: workshopId, name: org })
    users[u.key] = await insertId(k, 'users', {
      workshop_id: workshopId, email: u.email, name: u.name, role: u.role,
      client_org_id: org ? orgs[org] : null, password_hash: hash,
      pin_hash: 'pin' in u ? await hasher.make(u.pin) : null,
    })
    // a client user is a contact of their organisation, with every job mail on
    if (org) await k('client_contacts').insert({ workshop_id: workshopId, client_org_id: orgs[org], name: u.name, email: u.email, role: 'Project contact' })
  }
  return { orgs, users }
}

async function seedCatalogue(k: Knex, workshopId: number, leadId: number) {
  const grades: Ids = {}
  const names = { 'beta-casting': 'Fine casting (beta)', 'beta-fibrous': 'Fibrous (beta)', 'alpha-casting': 'Hard casting (alpha)' } as const
  for (const [key, g] of Object.entries(GRADE_PRESETS) as [keyof typeof names, (typeof GRADE_PRESETS)[keyof typeof names]][]) {
    grades[key] = await insertId(k, 'plaster_grades', {
      workshop_id: workshopId, name: names[key], preset_key: key, form: g.form, powder_density: g.powderDensity,
      consistency_min: g.consistency.min, consistency_max: g.consistency.max, consistency_default: g.consistency.default,
      demould_minutes_ref: g.demouldMinutesRef, set_time_water_exponent: g.setTimeWaterExponent,
      temperature_factors: JSON.stringify(g.temperatureFactors), hydration_heat: g.hydrationHeat,
      set_expansion_pct: g.setExpansionPct, purity: g.purity, bag_kg: 25,
    })
  }
  const lots: Ids = {
    fine1: await insertId(k, 'plaster_lots', { workshop_id: workshopId, grade_id: grades['beta-casting'], lot_code: 'FC-2611-A', bags_received: 40, bag_kg: 25, received_on: isoDay(-20), use_by: isoDay(140) }),
    fine0: await insertId(k, 'plaster_lots', { workshop_id: workshopId, grade_id: grades['beta-casting'], lot_code: 'FC-2605-C', bags_received: 12, bag_kg: 25, received_on: isoDay(-190), use_by: isoDay(-8), notes: 'Old stock: test a small batch first' }),
    fibrous: await insertId(k, 'plaster_lots', { workshop_id: workshopId, grade_id: grades['beta-fibrous'], lot_code: 'FB-2610-B', bags_received: 20, bag_kg: 25, received_on: isoDay(-35), use_by: isoDay(120) }),
    hard: await insertId(k, 'plaster_lots', { workshop_id: workshopId, grade_id: grades['alpha-casting'], lot_code: 'HC-2609-A', bags_received: 8, bag_kg: 25, received_on: isoDay(-60), use_by: isoDay(200) }),
  }
  const benches: Ids = {
    runs: await insertId(k, 'benches', { workshop_id: workshopId, name: 'Long bench', kind: 'run casting', length_m: 6, sort_order: 1 }),
    centres: await insertId(k, 'benches', { workshop_id: workshopId, name: 'Centre table', kind: 'flat casting', length_m: 2.4, sort_order: 2 }),
    small: await insertId(k, 'benches', { workshop_id: workshopId, name: 'Small-work bench', kind: 'enrichment', length_m: 1.8, sort_order: 3 }),
  }
  const mould = (row: Record<string, unknown>) => insertId(k, 'moulds', { workshop_id: workshopId, state_changed_by: leadId, state_changed_at: localDay(-40, 9), ...row })
  const moulds: Ids = {
    cr101: await mould({ bench_id: benches.runs, code: 'CR-101', casts: 'Egg-and-dart cornice, 1.2 m length', material: 'silicone', cavity_litres: 6.5, cast_length_m: 1.2, prep_minutes: 15, clean_minutes: 15, max_dwell_minutes: 240, pulls: 112, expected_pulls: 150 }),
    cr102: await mould({ bench_id: benches.runs, code: 'CR-102', casts: 'Egg-and-dart cornice, 1.2 m length (second copy)', material: 'silicone', cavity_litres: 6.5, cast_length_m: 1.2, prep_minutes: 15, clean_minutes: 15, max_dwell_minutes: 240, pulls: 140, expected_pulls: 150 }),
    cr115: await mould({ bench_id: benches.runs, code: 'CR-115', casts: 'Cornice internal corner block, gang of two', material: 'polyurethane', cavity_litres: 1.4, cavities: 2, prep_minutes: 10, clean_minutes: 10, max_dwell_minutes: 180, pulls: 38, expected_pulls: 200 }),
    cc210: await mould({ bench_id: benches.centres, code: 'CC-210', casts: 'Acanthus ceiling centre, 600 mm', material: 'polyurethane', ...CC210_SHELL, cavity_litres: shellLitres({ surfaceAreaM2: CC210_SHELL.surface_area_m2, shellThicknessMm: CC210_SHELL.shell_thickness_mm }), cast_type: 'fibrous', prep_minutes: 15, clean_minutes: 15, max_dwell_minutes: 180, pulls: 21, expected_pulls: 120 }),
    cc240: await mould({ bench_id: benches.centres, code: 'CC-240', casts: 'Plain ribbed ceiling centre, 450 mm', material: 'grp_case', cavity_litres: 2.6, prep_minutes: 20, clean_minutes: 20, max_dwell_minutes: 60, pulls: 64, expected_pulls: 300 }),
    cb12: await mould({ bench_id: benches.small, code: 'CB-12', casts: 'Scroll corbel, 220 mm', material: 'silicone', cavity_litres: 1.9, prep_minutes: 10, clean_minutes: 10, max_dwell_minutes: 240, pulls: 9, expected_pulls: 150 }),
    pm33: await mould({ bench_id: benches.small, code: 'PM-33', casts: 'Bead-and-reel panel moulding, 0.9 m', material: 'plaster_piece', cavity_litres: 0.8, cast_length_m: 0.9, prep_minutes: 20, clean_minutes: 15, max_dwell_minutes: 45, pulls: 55, expected_pulls: 80, state: 'repair', state_reason: 'Chipped key on the return; re-cast the piece' }),
    rs05: await mould({ bench_id: benches.small, code: 'RS-05', casts: 'Rose enrichment, 90 mm', material: 'gelatine', cavity_litres: 0.2, prep_minutes: 10, clean_minutes: 5, max_dwell_minutes: 40, pulls: 14, expected_pulls: 25 }),
  }
  // identical moulds share a profile: the planner may use either copy for an item of the profile
  const profile = (name: string) => insertId(k, 'profiles', { workshop_id: workshopId, name })
  const profiles: Ids = { eggDart: await profile('Egg-and-dart cornice'), corbel: await profile('Scroll corbel') }
  await k('moulds').whereIn('id', [moulds.cr101!, moulds.cr102!]).update({ profile_id: profiles.eggDart })
  await k('moulds').where({ id: moulds.cb12 }).update({ profile_id: profiles.corbel })
  // a second corbel mould being made: the planner puts nothing in it before its available-from day
  moulds.cb14 = await mould({ bench_id: benches.small, code: 'CB-14', casts: 'Scroll corbel, 220 mm (second copy, being made)', material: 'silicone', cavity_litres: 1.9, prep_minutes: 10, clean_minutes: 10, max_dwell_minutes: 240, pulls: 0, expected_pulls: 150, profile_id: profiles.corbel })
  await k('mould_works').insert({
    workshop_id: workshopId, mould_id: moulds.cb14, kind: 'new', assigned_to: leadId, started_on: isoDay(-3), available_from: isoDay(8),
    stages: JSON.stringify([{ stage: 'model', leadDays: 1, done: true }, { stage: 'running', leadDays: 2, done: true }, { stage: 'case', leadDays: 2, done: false }, { stage: 'mould', leadDays: 3, done: false }]),
    notes: 'Squeeze taken from CB-12; silicone to go on after the case',
  })
  // Consumables kept as stock: the fibrous centre is laid up with two layers of hessian scrim
  // and timber laths across its back. Masses per unit are round figures of common practice
  // (hessian about 0.3 kg/m², a 25 × 6 mm softwood lath about 0.08 kg/m), not measured ones.
  const consumable = (row: Record<string, unknown>) => insertId(k, 'consumables', { workshop_id: workshopId, ...row })
  const consumables: Ids = {
    scrim: await consumable({ name: 'Hessian scrim', unit: 'm2', kg_per_unit: 0.3 }),
    laths: await consumable({ name: 'Timber laths', unit: 'm', kg_per_unit: 0.08 }),
  }
  await k('consumable_moves').insert([
    { workshop_id: workshopId, consumable_id: consumables.scrim, kind: 'received', quantity: 25, note: 'Roll, 1 m wide', actor_id: leadId },
    { workshop_id: workshopId, consumable_id: consumables.laths, kind: 'received', quantity: 60, note: 'Bundle of 2.4 m lengths', actor_id: leadId },
  ])
  await k('mould_consumables').insert([
    { workshop_id: workshopId, mould_id: moulds.cc210, consumable_id: consumables.scrim, quantity_per_cast: Math.round(suggestedScrimM2({ surfaceAreaM2: CC210_SHELL.surface_area_m2 }) * 100) / 100 },
    { workshop_id: workshopId, mould_id: moulds.cc210, consumable_id: consumables.laths, quantity_per_cast: 1.8 },
  ])
  return { grades, lots, benches, moulds, profiles }
}

export async function seedDemo(k: Knex) {
  await k.transaction(async (trx) => {
    const workshopId = await insertId(trx, 'workshops', {
      name: 'Larkspur Ornamental Plaster', units: 'metric', timezone: TZ,
      shift_start: '07:30', shift_end: '16:00', default_shop_temp_c: 17, default_humidity_pct: 60,
    })
    const { orgs, users } = await seedPeople(trx, workshopId)
    const cat = await seedCatalogue(trx, workshopId, users.lead!)
    await seedJobs(trx, workshopId, { ...cat, orgs, users })
  })
}

interface Ctx { grades: Ids; lots: Ids; benches: Ids; moulds: Ids; profiles: Ids; orgs: Ids; users: Ids }

async function seedJobs(k: Knex, workshopId: number, c: Ctx) {
  const job = (row: Record<string, unknown>) => insertId(k, 'jobs', { workshop_id: workshopId, ...row })
  const site = (org: string, row: Record<string, unknown>) => insertId(k, 'client_sites', { workshop_id: workshopId, client_org_id: c.orgs[org], ...row })
  const sites = {
    fernhill: await site('Hollin Row Architects', { name: 'Fernhill House, east wing', address: '1 Fernhill Lane, Example Town', postcode: 'EX1 2AB', opening_hours: 'Mon–Fri 08:00–16:00', parking: 'Gravel drive by the east door', lifting: 'No lift: two people to carry up one flight' }),
    alder: await site('Quayside Interiors', { name: 'Alder Street', address: '14 Alder Street, Example Town', postcode: 'EX2 7CD', opening_hours: 'Mon–Sat 08:00–17:00', parking: 'Loading bay, 30 minutes', lifting: 'Goods lift to every floor' }),
    mill: await site('Hollin Row Architects', { name: 'Mill Lane stair hall', address: '3 Mill Lane, Example Town', postcode: 'EX3 4EF', opening_hours: null, parking: 'Street parking only', lifting: null }),
  }
  const fernhill = await job({ code: 'J-2601', title: 'Drawing-room cornice', site: 'Fernhill House, east wing', client_org_id: c.orgs['Hollin Row Architects'], site_id: sites.fernhill, due_on: isoDay(21), sample_required: true, sample_state: 'approved', sample_comment: 'Crisp enrichment, go ahead.', sample_decided_by: c.users.client1, sample_decided_at: localDay(-6, 10) })
  const alder = await job({ code: 'J-2602', title: 'Ceiling centres for six flats', site: 'Alder Street', client_org_id: c.orgs['Quayside Interiors'], site_id: sites.alder, due_on: isoDay(35), sample_required: true, sample_state: 'awaiting_approval' })
  const mill = await job({ code: 'J-2603', title: 'Stair corbels', site: 'Mill Lane stair hall', client_org_id: c.orgs['Hollin Row Architects'], site_id: sites.mill, due_on: isoDay(42), notes: 'Client to confirm paint finish.' })
  await k('job_members').insert([
    { workshop_id: workshopId, job_id: fernhill, user_id: c.users.client1 },
    { workshop_id: workshopId, job_id: mill, user_id: c.users.client1 },
    { workshop_id: workshopId, job_id: alder, user_id: c.users.client2 },
  ])
  const walls = [{ lengthM: 5.2 }, { lengthM: 4.1 }, { lengthM: 5.2 }, { lengthM: 4.1 }]
  const item = (row: Record<string, unknown>) => insertId(k, 'job_items', { workshop_id: workshopId, ...row })
  const cornice = await item({ job_id: fernhill, mould_id: c.moulds.cr101, profile: 'Egg-and-dart cornice', profile_id: c.profiles.eggDart, description: 'Cornice run round the drawing room', run_m: 18.6, walls: JSON.stringify(walls), spares_pct: 10, pieces_needed: 18, grade_id: c.grades['beta-casting'], consistency: 70, sort_order: 1 })
  await item({ job_id: fernhill, mould_id: c.moulds.cr115, description: 'Internal corner blocks', quantity: 4, pieces_needed: 4, grade_id: c.grades['alpha-casting'], consistency: 35, sort_order: 2 })
  const centres = await item({ job_id: alder, mould_id: c.moulds.cc210, description: 'Acanthus ceiling centre, 600 mm', quantity: 6, pieces_needed: 6, grade_id: c.grades['beta-fibrous'], consistency: 68, sort_order: 1 })
  await item({ job_id: mill, mould_id: c.moulds.cb12, description: 'Scroll corbels', quantity: 8, pieces_needed: 8, grade_id: c.grades['alpha-casting'], consistency: 35, sort_order: 1 })

  const pour = (p: PourSeed) => seedPour(k, workshopId, c, p)
  for (const [i, hour] of [8, 10, 12, 14].entries()) {
    await pour({ item: cornice, mould: 'cr101', grade: 'beta-casting', lot: 'fine1', consistency: 70, day: -1, hour, caster: 'caster1', state: 'demoulded', mark: `J-2601#${String(i + 1).padStart(3, '0')}`, pieceState: i < 2 ? 'drying' : 'to_fettle' })
  }
  await pour({ item: centres, mould: 'cc210', grade: 'beta-fibrous', lot: 'fibrous', consistency: 68, day: -2, hour: 9, caster: 'caster2', state: 'demoulded', sample: true, mark: 'J-2602#001', pieceState: 'ready' })
  for (const hour of [8, 10, 13]) {
    await pour({ item: cornice, mould: 'cr101', grade: 'beta-casting', lot: 'fine1', consistency: 70, day: 0, hour, caster: 'caster1', state: 'planned' })
  }
  await pour({ item: cornice, mould: 'cr102', grade: 'beta-casting', lot: 'fine1', consistency: 70, day: 0, hour: 9, caster: 'caster2', state: 'planned' })
}

interface PourSeed {
  item: number
  mould: string
  grade: keyof typeof GRADE_PRESETS
  lot: string
  consistency: number
  day: number
  hour: number
  caster: string
  state: 'planned' | 'demoulded'
  sample?: boolean
  mark?: string
  pieceState?: string
}

async function seedPour(k: Knex, workshopId: number, c: Ctx, p: PourSeed) {
  const m = await k('moulds').where({ id: c.moulds[p.mould] }).first()
  const grade = GRADE_PRESETS[p.grade]
  const mouldCast = mouldCastFromRow(m)
  const batch = batchForCavity({ cavityLitres: pourLitres(mouldCast), consistency: p.consistency, grade, wastePct: 5 })
  const win = demouldWindow({ grade, consistency: p.consistency, slurryTempC: 17, maxDwellMinutes: m.max_dwell_minutes, setFactor: 1 })
  const mixAt = localDay(p.day, p.hour, 15)
  const at = (min: number) => new Date(mixAt.getTime() + min * 60_000)
  const slotStart = at(-m.prep_minutes)
  const slotEnd = at(win.openMinutes + m.clean_minutes)
  const done = p.state === 'demoulded'
  const pourId = await insertId(k, 'pours', {
    workshop_id: workshopId, job_item_id: p.item, mould_id: m.id, caster_id: c.users[p.caster], grade_id: c.grades[p.grade],
    lot_id: c.lots[p.lot], is_sample: p.sample ?? false, consistency: p.consistency,
    slot: k.raw('tstzrange(?, ?)', [slotStart.toISOString(), slotEnd.toISOString()]),
    mix_at: mixAt, demould_open_at: at(win.openMinutes), demould_close_at: at(win.closeMinutes), state: p.state,
    plaster_kg_planned: batch.plasterKg, water_kg_planned: batch.waterKg,
    plaster_kg_actual: done ? batch.plasterKg : null, water_kg_actual: done ? batch.waterKg : null,
    water_temp_c: done ? 16 : null, shop_temp_c: done ? 17 : null, slurry_temp_c: done ? 16.4 : null,
    mixing_at: done ? mixAt : null, poured_at: done ? at(4) : null, demoulded_at: done ? at(win.openMinutes + 6) : null,
    result: done ? 'sound' : null, created_by: c.users.lead,
  })
  await k('events').insert({ workshop_id: workshopId, entity: 'pour', entity_id: String(pourId), type: 'pour.planned', actor_id: c.users.lead, at: localDay(p.day - 1, 16), data: JSON.stringify({ mould: m.code }) })
  if (!done || !p.mark) return
  // the mould's consumables left the stock at the poured step, per cast × cavities
  const list = await k('mould_consumables as mc').join('consumables as cs', 'cs.id', 'mc.consumable_id')
    .where('mc.mould_id', m.id).select('mc.consumable_id', 'mc.quantity_per_cast', 'cs.name', 'cs.unit', 'cs.kg_per_unit')
  if (list.length) {
    await k('consumable_moves').insert(list.map(r => ({
      workshop_id: workshopId, consumable_id: r.consumable_id, kind: 'used', quantity: -Number(r.quantity_per_cast) * mouldCast.cavities, pour_id: pourId, actor_id: c.users[p.caster], at: at(4),
    })))
  }
  const cast = castFromBatch({ plasterKg: batch.plasterKg / 1.05, waterKg: batch.waterKg / 1.05, grade })
  const masses = pieceMasses({ cast, mould: mouldCast, consumables: list.map(r => ({ consumableId: Number(r.consumable_id), name: r.name, unit: r.unit, quantityPerCast: Number(r.quantity_per_cast), kgPerUnit: r.kg_per_unit === null ? null : Number(r.kg_per_unit) })) })
  const pieceId = await insertId(k, 'pieces', {
    workshop_id: workshopId, pour_id: pourId, job_item_id: p.item, mark: p.mark, state: p.pieceState ?? 'to_fettle',
    dry_mass_kg: masses.dryMassKg, wet_mass_kg: masses.wetMassKg,
  })
  await k('moulds').where({ id: m.id }).increment('pulls', 1)
  await k('events').insert({ workshop_id: workshopId, entity: 'pour', entity_id: String(pourId), type: 'pour.demoulded', actor_id: c.users[p.caster], at: at(win.openMinutes + 6), data: JSON.stringify({ result: 'sound', piece: pieceId, mark: p.mark }) })
  if (p.pieceState !== 'drying') return
  // put to dry an hour after demoulding, in a drying room at 24 °C and 50 %, with its dry-by
  const fettledAt = at(win.openMinutes + 66)
  const dry = finishingDryBy({ from: fettledAt, wetMassKg: cast.wetMassKg, dryMassKg: cast.dryMassKg, cavityLitres: Number(m.cavity_litres), airTempC: 24, relHumidityPct: 50 })
  await k('pieces').where({ id: pieceId }).update({ dry_by: dry.dryBy, drying_temp_c: 24, drying_humidity_pct: 50 })
  await k('events').insert({ workshop_id: workshopId, entity: 'piece', entity_id: String(pieceId), type: 'piece.fettled', actor_id: c.users.finisher, at: fettledAt, data: JSON.stringify({ from: 'to_fettle', to: 'drying', mark: p.mark, dryingTempC: 24, dryingHumidityPct: 50 }) })
}
