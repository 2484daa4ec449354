// Multi-cavity moulds and fibrous casts through the API: a pour's batch covers every cavity and
// its demould makes one piece per cavity with consecutive marks; a fibrous mould's batch comes
// from its face and shell, its consumables are kept as stock, listed on the day sheet beside the
// plaster and taken from stock when poured; the pieces carry their scrim and laths.
import { randomUUID } from 'node:crypto'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { call, signIn } from '../setup/http'
import { DEMO_PASSWORD, closeTestDb, demo, makeOtherWorkshop } from '../setup/fixtures'
import { boardFixture } from '../setup/board-fixtures'
import { batchForCavity, castFromBatch } from '#shared/utils/plaster'
import { plasterGradeFromRow } from '#shared/utils/catalogue'
import { leanPour } from '#shared/utils/board-lean'
import type { BoardPourRow } from '#shared/types/board'

let lead = ''
let caster = ''
let fx: Awaited<ReturnType<typeof boardFixture>>
let itemId = 0
let jobCode = ''

beforeAll(async () => {
  lead = await signIn(demo.lead.email, DEMO_PASSWORD)
  caster = await signIn(demo.caster1.email, DEMO_PASSWORD)
  fx = await boardFixture('cavities')
  const jobId = await fx.job()
  jobCode = (await fx.k('jobs').where({ id: jobId }).first('code')).code
  itemId = await fx.item(jobId, null, { pieces_needed: 10 })
})
afterAll(closeTestDb)

const act = (pourId: number, body: Record<string, unknown>) =>
  call(`/api/pours/${pourId}/actions`, { method: 'POST', cookie: caster, body: { actionId: randomUUID(), ...body } })
const mouldBody = (over: Record<string, unknown>) => ({
  code: `${fx.tag}-${randomUUID().slice(0, 4)}`, casts: 'Patera, 90 mm', material: 'silicone', prepMinutes: 10, cleanMinutes: 10,
  maxDwellMinutes: 240, pulls: 0, ...over,
})

async function newMould(over: Record<string, unknown>) {
  const r = await call('/api/moulds', { method: 'POST', cookie: lead, body: mouldBody(over) })
  expect(r.status, JSON.stringify(r.data)).toBe(201)
  return r.data
}

async function pourThrough(mouldId: number, slotStart: string, plasterKg: number, waterKg: number) {
  const p = await call('/api/pours', { method: 'POST', cookie: lead, body: { mouldId, slotStart, jobItemId: itemId, casterId: fx.casterId } })
  expect(p.status, JSON.stringify(p.data)).toBe(201)
  expect((await act(p.data.id, { kind: 'start_mixing', version: 1, waterTempC: 18 })).status).toBe(200)
  const poured = await act(p.data.id, { kind: 'poured', version: 2, plasterKg, waterKg, shopTempC: 18 })
  expect(poured.status, JSON.stringify(poured.data)).toBe(200)
  return p.data as { id: number; plasterKg: number; waterKg: number }
}

describe('a multi-cavity mould', () => {
  it('batches every cavity in one pour and makes one piece per cavity, numbered one after the other', async () => {
    const mould = await newMould({ cavityLitres: 0.35, cavities: 4 })
    expect(mould).toMatchObject({ cavities: 4, castType: 'solid' })
    const grade = plasterGradeFromRow(fx.grade)
    // the board's 5 % waste allowance over 4 × 0.35 L (board-rules POUR_WASTE_PCT)
    const batch = batchForCavity({ cavityLitres: 1.4, consistency: 70, grade, wastePct: 5 })
    const p = await pourThrough(mould.id, '2028-05-03T09:00:00Z', 1.36, 0.952)
    expect(p.plasterKg).toBeCloseTo(batch.plasterKg, 3)
    const before = await fx.k('pieces').where({ workshop_id: fx.workshopId }).where('mark', 'like', `${jobCode}#%`).count({ n: '*' })
    const d = await act(p.id, { kind: 'demoulded', version: 3, result: 'sound' })
    expect(d.status, JSON.stringify(d.data)).toBe(200)
    const first = Number(before[0]!.n) + 1
    const marks = [0, 1, 2, 3].map(i => `${jobCode}#${String(first + i).padStart(3, '0')}`)
    expect(d.data.pieces.map((x: { mark: string }) => x.mark)).toEqual(marks)
    expect(d.data.piece.mark).toBe(marks[0])
    expect(d.data.card.actual.pieceMarks).toEqual(marks)
    expect(d.data.card.mould).toMatchObject({ cavities: 4 })
    const pieces = await fx.k('pieces').where({ pour_id: p.id }).orderBy('cavity').select('mark', 'cavity', 'dry_mass_kg')
    expect(pieces.map(x => x.cavity)).toEqual([1, 2, 3, 4])
    const cast = castFromBatch({ plasterKg: 1.36 / 1.05, waterKg: 0.952 / 1.05, grade })
    for (const x of pieces) expect(Number(x.dry_mass_kg)).toBeCloseTo(cast.dryMassKg / 4, 3)
    // one pull of the mould, four pieces toward the item on the client's counts and the register
    expect((await fx.k('moulds').where({ id: mould.id }).first('pulls')).pulls).toBe(1)
    const jobId = (await fx.k('job_items').where({ id: itemId }).first('job_id')).job_id
    const reg = await call(`/api/jobs/${jobId}/register`, { cookie: lead })
    expect(reg.status).toBe(200)
    const line = reg.data.rows.find((r: { pourId: number }) => Number(r.pourId) === p.id)
    expect(line).toMatchObject({ cavities: 4, mark: marks.join(' ') })
    // the board names the mould's cavities beside its lane, so its bars read × 4
    const board = await call('/api/board?from=2028-05-03&to=2028-05-03', { cookie: lead })
    expect(board.status).toBe(200)
    const lane = board.data.moulds.find((m: { id: number }) => m.id === mould.id)
    expect(lane).toMatchObject({ code: mould.code, cavities: 4 })
    expect((board.data.pours as BoardPourRow[]).map(leanPour).some(x => x.id === p.id && x.mouldId === mould.id)).toBe(true)
    expect(board.data.moulds.find((m: { id: number }) => m.id !== mould.id)?.cavities).toBeGreaterThanOrEqual(1)
  })
})

describe('consumables and a fibrous mould', () => {
  it('keeps scrim and laths as stock, batches from the face and shell, lists the day\'s use and deducts it when poured', async () => {
    const scrim = await call('/api/consumables', { method: 'POST', cookie: lead, body: { name: `Hessian ${fx.tag}`, unit: 'm2', kgPerUnit: 0.3 } })
    expect(scrim.status, JSON.stringify(scrim.data)).toBe(201)
    const laths = await call('/api/consumables', { method: 'POST', cookie: lead, body: { name: `Laths ${fx.tag}`, unit: 'each', kgPerUnit: 0.25 } })
    expect(laths.status).toBe(201)
    const got = await call(`/api/consumables/${scrim.data.id}/receive`, { method: 'POST', cookie: lead, body: { quantity: 20 } })
    expect(got.status, JSON.stringify(got.data)).toBe(200)
    expect(got.data.onHand).toBe(20)
    expect((await call(`/api/consumables/${laths.data.id}/receive`, { method: 'POST', cookie: lead, body: { quantity: 30, note: 'delivery' } })).data.onHand).toBe(30)

    // our own worked example (tests/unit/plaster-fibrous.test.ts): 0.54 m² × 10 mm = 5.4 L a piece
    const mould = await newMould({
      casts: 'Fibrous cornice length', castType: 'fibrous', surfaceAreaM2: 0.54, shellThicknessMm: 10,
      consumables: [{ consumableId: scrim.data.id, quantityPerCast: 1.188 }, { consumableId: laths.data.id, quantityPerCast: 3 }],
    })
    expect(mould).toMatchObject({ castType: 'fibrous', cavityLitres: 5.4, surfaceAreaM2: 0.54, shellThicknessMm: 10 })
    expect(mould.consumables.map((c: { name: string }) => c.name).sort()).toEqual([`Hessian ${fx.tag}`, `Laths ${fx.tag}`])

    const grade = plasterGradeFromRow(fx.grade)
    const p = await call('/api/pours', { method: 'POST', cookie: lead, body: { mouldId: mould.id, slotStart: '2028-05-04T09:00:00Z', jobItemId: itemId, casterId: fx.casterId } })
    expect(p.status, JSON.stringify(p.data)).toBe(201)
    expect(p.data.plasterKg).toBeCloseTo(batchForCavity({ cavityLitres: 5.4, consistency: 70, grade, wastePct: 5 }).plasterKg, 3)

    const sheet = await call('/api/day-sheet?day=2028-05-04', { cookie: lead })
    expect(sheet.status, JSON.stringify(sheet.data)).toBe(200)
    const line = sheet.data.consumables.find((c: { consumableId: number }) => c.consumableId === scrim.data.id)
    expect(line).toMatchObject({ unit: 'm2', onHand: 20 })
    expect(line.quantity).toBeCloseTo(1.188, 6)
    expect(sheet.data.requisition.length).toBeGreaterThan(0)
    // the CSV lists the same consumables after the requisition, each in its own unit
    const csv = await call('/api/day-sheet/export?day=2028-05-04', { cookie: lead })
    expect(csv.status).toBe(200)
    const lines = String(csv.data).replace(/^\uFEFF/, '').trim().split(/\r?\n/)
    const header = lines[0]!.split(',')
    const row = (name: string) => {
      const cells = lines.find(l => l.includes(name))!.split(',')
      return Object.fromEntries(header.map((h, i) => [h, cells[i]]))
    }
    expect(row(`Hessian ${fx.tag}`)).toMatchObject({ section: 'consumable', quantity: '1.19', on_hand: '20', unit: 'm²' })
    expect(row(`Laths ${fx.tag}`)).toMatchObject({ section: 'consumable', quantity: '3', on_hand: '30', unit: 'each' })

    expect((await act(p.data.id, { kind: 'start_mixing', version: 1, waterTempC: 18 })).status).toBe(200)
    const list = async () => (await call('/api/consumables', { cookie: lead })).data as { id: number; onHand: number }[]
    expect((await list()).find(c => c.id === scrim.data.id)!.onHand).toBe(20)
    expect((await act(p.data.id, { kind: 'poured', version: 2, plasterKg: 5.25, waterKg: 3.675, shopTempC: 18 })).status).toBe(200)
    const after = await list()
    expect(after.find(c => c.id === scrim.data.id)!.onHand).toBeCloseTo(20 - 1.188, 6)
    expect(after.find(c => c.id === laths.data.id)!.onHand).toBe(27)

    const d = await act(p.data.id, { kind: 'demoulded', version: 3, result: 'sound' })
    expect(d.status, JSON.stringify(d.data)).toBe(200)
    const piece = await fx.k('pieces').where({ pour_id: p.data.id }).first()
    // the piece carries its scrim and laths: 1.188 × 0.3 + 3 × 0.25 = 1.1064 kg (our example's figures)
    const cast = castFromBatch({ plasterKg: 5.25 / 1.05, waterKg: 3.675 / 1.05, grade })
    expect(Number(piece.dry_mass_kg)).toBeCloseTo(cast.dryMassKg + 1.1064, 3)
    expect(Number(piece.wet_mass_kg)).toBeCloseTo(cast.wetMassKg + 1.1064, 3)
  })

  it('refuses a fibrous mould without its face, in the user\'s words, and another workshop\'s consumable', async () => {
    const r = await call('/api/moulds', { method: 'POST', cookie: lead, body: mouldBody({ castType: 'fibrous', shellThicknessMm: 10 }) })
    expect(r.status).toBe(422)
    expect(r.data.data.problems).toEqual(expect.arrayContaining([expect.objectContaining({ field: 'surfaceAreaM2', message: expect.stringMatching(/Face area/) })]))
    const other = await makeOtherWorkshop()
    const [foreign] = await fx.k('consumables').insert({ workshop_id: other.workshopId, name: `Foreign ${fx.tag}`, unit: 'm' }).returning('id')
    const f = await call('/api/moulds', { method: 'POST', cookie: lead, body: mouldBody({ cavityLitres: 1, consumables: [{ consumableId: Number(foreign.id), quantityPerCast: 1 }] }) })
    expect(f.status).toBe(422)
    expect(f.data.data.problems[0].field).toBe('consumables[0].consumableId')
    const recv = await call(`/api/consumables/${foreign.id}/receive`, { method: 'POST', cookie: lead, body: { quantity: 5 } })
    expect(recv.status).toBe(404)
  })

  it('exports and reads back the cast columns', async () => {
    const csv = await call('/api/moulds/export', { cookie: lead })
    expect(csv.status).toBe(200)
    const header = String(csv.data).replace(/^\uFEFF/, '').split(/\r?\n/)[0]!
    expect(header).toContain('cavities,cast,face area (m²),shell thickness (mm)')
  })
})

describe('the demo workshop', () => {
  it('has a fibrous ceiling centre laid up with scrim and laths, and a gang mould of two corner blocks', async () => {
    const moulds = (await call('/api/moulds', { cookie: lead })).data as { id: number; code: string; castType: string; cavities: number; surfaceAreaM2: number | null }[]
    const centre = moulds.find(m => m.code === 'CC-210')!
    expect(centre).toMatchObject({ castType: 'fibrous', cavities: 1, surfaceAreaM2: 0.42 })
    const detail = (await call(`/api/moulds/${centre.id}`, { cookie: lead })).data
    expect(detail.consumables.map((c: { name: string }) => c.name).sort()).toEqual(['Hessian scrim', 'Timber laths'])
    expect(moulds.find(m => m.code === 'CR-115')).toMatchObject({ castType: 'solid', cavities: 2 })
    // the sample centre already cast took its scrim and laths from stock, and its piece carries them
    const sample = await fx.k('pieces as pc').join('pours as p', 'p.id', 'pc.pour_id').where({ 'pc.mark': 'J-2602#001', 'p.workshop_id': fx.workshopId }).first('p.id', 'pc.dry_mass_kg', 'p.plaster_kg_actual', 'p.water_kg_actual')
    const used = await fx.k('consumable_moves').where({ pour_id: sample.id, kind: 'used' }).select('quantity')
    expect(used.map(u => Number(u.quantity)).sort((a, b) => a - b)).toEqual([-1.8, -0.92])
    const grade = plasterGradeFromRow(await fx.k('plaster_grades').where({ workshop_id: fx.workshopId, preset_key: 'beta-fibrous' }).first())
    const cast = castFromBatch({ plasterKg: Number(sample.plaster_kg_actual) / 1.05, waterKg: Number(sample.water_kg_actual) / 1.05, grade })
    // 0.92 m² × 0.3 kg/m² + 1.8 m × 0.08 kg/m = 0.42 kg (the demo's round figures)
    expect(Number(sample.dry_mass_kg)).toBeCloseTo(cast.dryMassKg + 0.42, 2)
  })
})
