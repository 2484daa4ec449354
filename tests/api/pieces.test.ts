// The piece page and labels from the API: a piece's story (pour, weighings, register entries,
// next steps) for every staff role and a 404 for another workshop; a label's QR code read back
// through the same decoder the tablets use (jsQR) to the piece's address with its token; the
// token staying the same over reprints until a lead revokes it; scans of revoked, foreign and
// unknown labels refused in words; where a run piece goes; the two-person lift mark; a job's
// sheet. Pieces are made through the floor API (tests/setup/finishing-fixtures.ts).
import { randomBytes, randomUUID } from 'node:crypto'
import jsQR from 'jsqr'
import sharp from 'sharp'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { call, signIn } from '../setup/http'
import { DEMO_PASSWORD, closeTestDb, demo, makeOtherWorkshop } from '../setup/fixtures'
import { finishingFixture } from '../setup/finishing-fixtures'
import { LABEL_TOKEN_PATTERN } from '#shared/utils/piece-labels'

let fx: Awaited<ReturnType<typeof finishingFixture>>
let finisher = ''
let caster = ''
let lead = ''
let client = ''
let otherLead = ''

beforeAll(async () => {
  fx = await finishingFixture('pcs')
  lead = fx.lead
  caster = fx.caster
  finisher = await signIn(demo.finisher.email, DEMO_PASSWORD)
  client = await signIn(demo.client1.email, DEMO_PASSWORD)
  const other = await makeOtherWorkshop()
  otherLead = await signIn(other.lead.email, DEMO_PASSWORD)
})
afterAll(closeTestDb)

const act = (pieceId: number, body: Record<string, unknown>) =>
  call(`/api/pieces/${pieceId}/actions`, { method: 'POST', cookie: finisher, body: { actionId: randomUUID(), ...body } })

/** The text of a QR code in an SVG, read as the tablet reads a camera frame: rasterised, then jsQR. */
async function readQr(svg: string): Promise<string | null> {
  const { data, info } = await sharp(Buffer.from(svg), { density: 300 }).resize(400).flatten({ background: '#fff' }).ensureAlpha().raw().toBuffer({ resolveWithObject: true })
  return jsQR(new Uint8ClampedArray(data.buffer, data.byteOffset, data.length), info.width, info.height)?.data ?? null
}

describe('the piece page', () => {
  it('tells a piece\'s story to the lead, caster and finisher: pour, weighings, register entries and next steps', async () => {
    const p = await fx.piece()
    expect((await act(p.id, { kind: 'fettled', version: 1 })).status).toBe(200)
    expect((await act(p.id, { kind: 'weighed', version: 2, weighedKg: Number((p.dryMassKg * 1.2).toFixed(3)) })).status).toBe(200)
    for (const cookie of [lead, caster, finisher]) {
      const r = await call(`/api/pieces/${p.id}`, { cookie })
      expect(r.status, JSON.stringify(r.data)).toBe(200)
      expect(r.data.piece).toMatchObject({ id: p.id, mark: p.mark, state: 'drying' })
      expect(r.data.pour).toMatchObject({ id: p.pourId, consistency: 70, caster: fx.casterName, result: 'sound' })
      expect(r.data.pour.demouldedAt).toEqual(expect.any(String))
      expect(r.data.weighings).toHaveLength(1)
      // 20 % over the dry mass is far from dry (0.5 % free water at most: plaster-drying.ts)
      expect(r.data.weighings[0]).toMatchObject({ isDry: false })
      expect(r.data.weighings[0].freeWaterPct).toBeCloseTo(20, 1)
      expect(r.data.history.map((h: { kind: string }) => h.kind)).toEqual(['created', 'fettled', 'weighed'])
      // FINISHING_STEPS: a drying piece may be weighed, passed ready, sent to repair or rejected
      expect(r.data.nextSteps).toEqual(['weighed', 'ready', 'repair', 'rejected'])
      expect(r.data.dispatch).toBeNull()
      expect(r.data.label).toBeNull()
    }
  })

  it('keeps a repair\'s reason in the story', async () => {
    const p = await fx.piece()
    expect((await act(p.id, { kind: 'repair', version: 1, reason: 'chipped enrichment' })).status).toBe(200)
    const r = await call(`/api/pieces/${p.id}`, { cookie: finisher })
    expect(r.data.history).toEqual([expect.objectContaining({ kind: 'created', by: fx.casterName }), expect.objectContaining({ kind: 'repair', note: 'chipped enrichment' })])
    expect(r.data.nextSteps).toEqual(['repaired', 'rejected', 'repair_start', 'repair_stop'])
  })

  it('is a 404 to another workshop and a 403 to a client', async () => {
    const p = await fx.piece()
    expect((await call(`/api/pieces/${p.id}`, { cookie: otherLead })).status).toBe(404)
    expect((await call(`/api/pieces/${p.id}/label`, { cookie: otherLead })).status).toBe(404)
    expect((await call(`/api/pieces/${p.id}`, { cookie: client })).status).toBe(403)
  })
})

describe('labels', () => {
  it('carries a QR code that reads back to the piece page\'s address with the label\'s token, the same on every reprint', async () => {
    const p = await fx.piece()
    const first = await call(`/api/pieces/${p.id}/label`, { cookie: caster })
    expect(first.status, JSON.stringify(first.data)).toBe(200)
    const url = new URL(first.data.url)
    expect(url.pathname).toBe(`/pieces/${p.id}`)
    const token = url.searchParams.get('label')!
    expect(token).toMatch(LABEL_TOKEN_PATTERN)
    expect(first.data).toMatchObject({ pieceId: p.id, mark: p.mark, teamLift: false })
    // what the label prints beside the code: its job, its item and the weight to lift it at
    // (a cast not yet fettled at its wet mass, finishingHandlingKg)
    const made = await fx.k('job_items').join('jobs', 'jobs.id', 'job_items.job_id').where('job_items.id', p.itemId).first('jobs.code', 'jobs.title', 'job_items.description')
    expect(first.data).toMatchObject({ job: { code: made.code, title: made.title }, item: made.description })
    expect(first.data.kg).toBeCloseTo(p.wetMassKg, 2)
    expect(await readQr(first.data.qrSvg)).toBe(first.data.url)
    const again = await call(`/api/pieces/${p.id}/label`, { cookie: finisher })
    expect(again.data.url).toBe(first.data.url)
    expect((await call(`/api/pieces/${p.id}`, { cookie: lead })).data.label).toEqual({ createdAt: expect.any(String) })
  })

  it('opens its piece when scanned, with the next steps; revoked by a lead it opens nothing, and a reprint draws a new token', async () => {
    const p = await fx.piece()
    const token = new URL((await call(`/api/pieces/${p.id}/label`, { cookie: lead })).data.url).searchParams.get('label')!
    const scan = await call(`/api/labels/${token}`, { cookie: finisher })
    expect(scan.status).toBe(200)
    expect(scan.data.piece).toMatchObject({ id: p.id, mark: p.mark, state: 'to_fettle' })
    expect(scan.data.nextSteps).toEqual(['fettled', 'repair', 'rejected', 'fettle_start', 'fettle_stop'])

    expect((await call(`/api/pieces/${p.id}/label/revoke`, { method: 'POST', cookie: finisher })).status).toBe(403)
    const revoked = await call(`/api/pieces/${p.id}/label/revoke`, { method: 'POST', cookie: lead })
    expect(revoked.data).toEqual({ pieceId: p.id, revoked: 1 })
    const refused = await call(`/api/labels/${token}`, { cookie: finisher })
    expect(refused.status).toBe(404)
    expect(refused.data.message).toMatch(/revoked: it opens nothing/)

    const reprint = await call(`/api/pieces/${p.id}/label`, { cookie: lead })
    const newToken = new URL(reprint.data.url).searchParams.get('label')!
    expect(newToken).not.toBe(token)
    expect((await call(`/api/labels/${newToken}`, { cookie: caster })).data.piece.id).toBe(p.id)
    expect((await call(`/api/labels/${token}`, { cookie: caster })).status).toBe(404)
    // revoking when nothing is live says so and changes nothing else
    await call(`/api/pieces/${p.id}/label/revoke`, { method: 'POST', cookie: lead })
    expect((await call(`/api/pieces/${p.id}/label/revoke`, { method: 'POST', cookie: lead })).data.revoked).toBe(0)
  })

  it('refuses another workshop\'s label, a code never issued and a code of the wrong shape, in words', async () => {
    const p = await fx.piece()
    const token = new URL((await call(`/api/pieces/${p.id}/label`, { cookie: lead })).data.url).searchParams.get('label')!
    const foreign = await call(`/api/labels/${token}`, { cookie: otherLead })
    expect(foreign.status).toBe(404)
    expect(foreign.data.message).toMatch(/not one of this workshop's: it opens nothing/)
    const unknown = await call(`/api/labels/${randomBytes(16).toString('base64url')}`, { cookie: lead })
    expect(unknown.status).toBe(404)
    expect(unknown.data.message).toBe(foreign.data.message)
    const shape = await call('/api/labels/not-a-label', { cookie: lead })
    expect(shape.status).toBe(422)
    expect(shape.data.message).toMatch(/not a Setline label/)
  })

  it('marks a piece over 25 kg for a two-person lift (HSE INDG143\'s guideline figure)', async () => {
    const p = await fx.piece()
    // a cast still waiting to be fettled is lifted at its wet mass (finishingHandlingKg)
    await fx.k('pieces').where({ id: p.id }).update({ wet_mass_kg: 31.5, dry_mass_kg: 26 })
    const r = await call(`/api/pieces/${p.id}/label`, { cookie: lead })
    expect(r.data).toMatchObject({ kg: 31.5, teamLift: true })
    await fx.k('pieces').where({ id: p.id }).update({ wet_mass_kg: 24.9 })
    expect((await call(`/api/pieces/${p.id}/label`, { cookie: lead })).data).toMatchObject({ kg: 24.9, teamLift: false })
  })

  it('says where a run piece goes: its length in the cut list and its wall, and the spare', async () => {
    // hand-worked: one 3 m wall from 1.5 m casts is two full lengths, both for wall 1; 50 % spares adds a third length
    const mould = await fx.mould({ cast_length_m: 1.5 })
    const job = await fx.job()
    const item = await fx.item(job, mould, { walls: JSON.stringify([{ lengthM: 3 }]), min_piece_m: 0.3, spares_pct: 50, pieces_needed: 3 })
    const pieces = [await fx.piece({ itemId: item, mouldId: mould }), await fx.piece({ itemId: item, mouldId: mould, slotStart: '2031-03-06T09:00:00Z' }),
      await fx.piece({ itemId: item, mouldId: mould, slotStart: '2031-03-07T09:00:00Z' })]
    const places = await Promise.all(pieces.map(async p => (await call(`/api/pieces/${p.id}/label`, { cookie: lead })).data.place))
    expect(places).toEqual([
      { lengthNo: 1, lengths: 2, walls: [1], hasReturn: false, spare: false },
      { lengthNo: 2, lengths: 2, walls: [1], hasReturn: false, spare: false },
      { lengthNo: 3, lengths: 2, walls: [], hasReturn: false, spare: true },
    ])
    // a piece of no run has no place
    expect((await call(`/api/pieces/${(await fx.piece()).id}/label`, { cookie: lead })).data.place).toBeNull()
  })

  it('prints a job\'s sheet: every piece still in the shop, by mark, a rejected one left out', async () => {
    const job = await fx.job()
    const item = await fx.item(job, null)
    const a = await fx.piece({ itemId: item })
    const b = await fx.piece({ itemId: item, slotStart: '2031-03-08T09:00:00Z' })
    const c = await fx.piece({ itemId: item, slotStart: '2031-03-09T09:00:00Z' })
    expect((await act(c.id, { kind: 'rejected', version: 1, reason: 'cracked through' })).status).toBe(200)
    const r = await call(`/api/jobs/${job}/labels`, { cookie: finisher })
    expect(r.status).toBe(200)
    expect(r.data.map((l: { mark: string }) => l.mark)).toEqual([a.mark, b.mark].sort())
    for (const l of r.data) expect(await readQr(l.qrSvg)).toBe(l.url)
    expect((await call(`/api/jobs/${job}/labels`, { cookie: otherLead })).status).toBe(404)
  })
})
