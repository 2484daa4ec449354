// Pieces of a test's own for the finishing tests, made the way the shop makes them: a pour
// planned on a fresh mould (in 2031, clear of other files' days) and taken through the floor
// API (start mixing → poured → demoulded), the steps dated a few hours back so finishing steps
// can be back-dated after them.
import { randomUUID } from 'node:crypto'
import { call, signIn } from './http'
import { DEMO_PASSWORD, demo } from './fixtures'
import { boardFixture } from './board-fixtures'

const HOUR = 3_600_000
const ago = (ms: number) => new Date(Date.now() - ms).toISOString()

export async function finishingFixture(label: string) {
  const fx = await boardFixture(label)
  const lead = await signIn(demo.lead.email, DEMO_PASSWORD)
  const caster = await signIn(demo.caster1.email, DEMO_PASSWORD)

  const step = async (pourId: number, body: Record<string, unknown>) => {
    const r = await call(`/api/pours/${pourId}/actions`, { method: 'POST', cookie: caster, body: { actionId: randomUUID(), ...body } })
    if (r.status !== 200) throw new Error(`floor step ${body.kind} failed: ${r.status} ${JSON.stringify(r.data)}`)
    return r.data
  }

  /**
   * A piece demoulded from a pour of `itemId` (a fresh job's item when not given) on `mouldId`
   * (fresh when not given), `hoursBack` hours ago (2 unless given; more lets a test back-date two
   * weighings a day apart, as constant weight needs).
   */
  async function piece(opts: { itemId?: number; mouldId?: number; result?: 'sound' | 'defect'; slotStart?: string; hoursBack?: number } = {}) {
    const back = (opts.hoursBack ?? 2) * HOUR
    const itemId = opts.itemId ?? await fx.item(await fx.job(), null)
    const mouldId = opts.mouldId ?? await fx.mould()
    const planned = await call('/api/pours', { method: 'POST', cookie: lead, body: { mouldId, slotStart: opts.slotStart ?? '2031-03-05T09:00:00Z', jobItemId: itemId, casterId: fx.casterId } })
    if (planned.status !== 201) throw new Error(`planning a pour failed: ${planned.status} ${JSON.stringify(planned.data)}`)
    const pourId = planned.data.id as number
    await step(pourId, { kind: 'start_mixing', version: 1, waterTempC: 18, at: ago(back + HOUR) })
    await step(pourId, { kind: 'poured', version: 2, plasterKg: 2.9, waterKg: 2.03, shopTempC: 17, at: ago(back + 0.9 * HOUR) })
    const d = await step(pourId, { kind: 'demoulded', version: 3, at: ago(back), ...(opts.result === 'defect' ? { result: 'defect', defect: 'crack' } : { result: 'sound' }) })
    const row = await fx.k('pieces').where({ pour_id: pourId }).first('id', 'mark', 'dry_mass_kg', 'wet_mass_kg', 'version')
    return { id: Number(row.id), mark: row.mark as string, pourId, mouldId, itemId, dryMassKg: Number(row.dry_mass_kg), wetMassKg: Number(row.wet_mass_kg), pieceMark: d.piece.mark as string }
  }

  return { ...fx, lead, caster, piece }
}
