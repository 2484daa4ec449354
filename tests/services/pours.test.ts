// The pour rules below the routes, against the file's own database and without a build:
// the exclusion constraint's refusal as a 409, and the planner's accept as one transaction.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { boardFixture } from '../setup/board-fixtures'
import { demo } from '../setup/fixtures'
import { poursRepo } from '../../server/repos/pours'
import { planPourRow, withOverlapAnswer } from '../../server/services/pours'
import { loadWorkshop } from '../../server/services/workshop'
import { acceptPlan } from '../../server/services/planning'
import { closeDb, useDb } from '../../server/utils/db'
import type { Actor } from '../../server/utils/auth'

let fx: Awaited<ReturnType<typeof boardFixture>>
let lead: Actor
beforeAll(async () => {
  fx = await boardFixture('svc-pours')
  const row = await fx.k('users').where({ email: demo.lead.email }).first('id', 'name', 'email', 'session_version')
  lead = { id: Number(row.id), workshopId: fx.workshopId, role: 'lead', name: row.name, email: row.email, sv: row.session_version }
})
afterAll(async () => {
  await closeDb()
})

const day = '2031-03-12' // a Wednesday; the file's database is its own, any day is quiet
const at = (clock: string) => new Date(`${day}T${clock}:00Z`)
const poursOn = async (mouldId: number) => Number((await fx.k('pours').where({ mould_id: mouldId }).count({ n: '*' }))[0]!.n)

describe('pours repo: the mould overlap', () => {
  it('is refused by the exclusion constraint, answered as a 409', async () => {
    const db = useDb()
    const ws = await loadWorkshop(db, fx.workshopId)
    const mouldId = await fx.mould()
    const write = await db.transaction(trx => planPourRow(trx, ws, { mouldId, slotStart: at('09:00') }))
    const first = await poursRepo.insert(db, ws.id, lead.id, write)
    // the same slot again, past the service's own clash check: only the constraint stands
    const refused = await poursRepo.insert(db, ws.id, lead.id, write).catch((e: unknown) => e)
    expect(refused).toMatchObject({ code: '23P01', constraint: 'pours_no_overlap' })
    await expect(withOverlapAnswer(ws, () => null, () => poursRepo.insert(db, ws.id, lead.id, write)))
      .rejects.toMatchObject({ statusCode: 409, message: 'This mould is already taken at that time' })
    // knowing the mould, the answer names the pour that holds it as the lead sees it (its mould
    // code and mixing time), and carries its id for the page, never in the words
    const code = (await fx.k('moulds').where({ id: mouldId }).first('code')).code as string
    const answer = await withOverlapAnswer(ws, () => ({ id: mouldId, start: write.slotStart, end: write.slotEnd }), () => poursRepo.insert(db, ws.id, lead.id, write)).catch((e: unknown) => e)
    expect(answer).toMatchObject({ statusCode: 409, message: expect.stringContaining(`pour on ${code} mixing at`) })
    expect((answer as Error).message).not.toContain(`pour ${first}`)
    expect((answer as { data?: { pourId?: number } }).data).toMatchObject({ pourId: first })
    expect(await poursOn(mouldId)).toBe(1)
  })
})

describe('planning service: accept', () => {
  it('writes every accepted pour', async () => {
    const [m1, m2] = [await fx.mould(), await fx.mould()]
    const item = await fx.item(await fx.job(), m1)
    const r = await acceptPlan(lead, { from: day, to: day }, [
      { jobItemId: item, mouldId: m1, slotStart: at('09:00') },
      { jobItemId: item, mouldId: m2, slotStart: at('09:00') },
    ])
    expect(r).toEqual({ created: 2 })
    expect([await poursOn(m1), await poursOn(m2)]).toEqual([1, 1])
    expect(await fx.k('events').where({ entity: 'pour', type: 'pour.planned' }).whereRaw(`data->>'planner' = 'true'`).whereIn('entity_id', (await fx.k('pours').whereIn('mould_id', [m1, m2]).pluck('id')).map(String)).count({ n: '*' }))
      .toEqual([{ n: 2 }])
  })

  it('writes none when one pour clashes: one transaction', async () => {
    const [free, taken] = [await fx.mould(), await fx.mould()]
    const item = await fx.item(await fx.job(), free)
    await acceptPlan(lead, { from: day, to: day }, [{ jobItemId: item, mouldId: taken, slotStart: at('11:00') }])
    const plan = [
      { jobItemId: item, mouldId: free, slotStart: at('11:00') },
      { jobItemId: item, mouldId: taken, slotStart: at('11:00') },
    ]
    await expect(acceptPlan(lead, { from: day, to: day }, plan)).rejects.toMatchObject({ statusCode: 409 })
    expect([await poursOn(free), await poursOn(taken)]).toEqual([0, 1])
  })
})
