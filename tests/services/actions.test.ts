// runOnce, the exactly-once wrapper of tablet actions, against the file's own database:
// a replay gets the stored answer without running the work again, and an action id is bound
// to the person, the step and the row it was first used for.
import { randomUUID } from 'node:crypto'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { demo, testDb } from '../setup/fixtures'
import { runOnce } from '../../server/services/actions'
import { closeDb } from '../../server/utils/db'
import { conflict } from '../../server/utils/errors'
import type { Actor } from '../../server/utils/auth'

const actor = async (key: 'caster1' | 'caster2'): Promise<Actor> => {
  const row = await testDb()('users').where({ email: demo[key].email }).first('id', 'workshop_id', 'role', 'name', 'email', 'session_version')
  return { id: Number(row.id), workshopId: Number(row.workshop_id), role: row.role, name: row.name, email: row.email, sv: row.session_version }
}

let caster: Actor
let other: Actor
beforeAll(async () => {
  [caster, other] = [await actor('caster1'), await actor('caster2')]
})
afterAll(async () => {
  await closeDb()
})

describe('runOnce', () => {
  it('runs the work once and gives a replay the stored answer', async () => {
    const id = randomUUID()
    let runs = 0
    let afters = 0
    const work = async () => ({ result: { run: ++runs }, after: () => afters++ })
    const first = await runOnce(caster, id, { kind: 'pour.poured', entityId: 7 }, work)
    const again = await runOnce(caster, id, { kind: 'pour.poured', entityId: 7 }, work)
    expect(first).toEqual({ status: 200, result: { run: 1 }, replayed: false })
    expect(again).toEqual({ status: 200, result: { run: 1 }, replayed: true })
    expect([runs, afters]).toEqual([1, 1])
    expect(await testDb()('processed_actions').where({ id }).first('kind', 'entity_id', 'status')).toEqual({ kind: 'pour.poured', entity_id: 7, status: 200 })
  })

  it('stores a refusal with nothing else of the work, and throws it again on replay', async () => {
    const id = randomUUID()
    const tag = `svc-action-${randomUUID().slice(0, 6)}`
    let runs = 0
    const work = async (trx: Parameters<Parameters<typeof runOnce>[3]>[0]) => {
      runs++
      await trx('benches').insert({ workshop_id: caster.workshopId, name: tag, sort_order: 99 })
      return conflict('The pour is not mixing', { state: 'planned' })
    }
    await expect(runOnce(caster, id, { kind: 'pour.poured', entityId: 8 }, work)).rejects.toMatchObject({ statusCode: 409, message: 'The pour is not mixing' })
    await expect(runOnce(caster, id, { kind: 'pour.poured', entityId: 8 }, work)).rejects.toMatchObject({ statusCode: 409, data: { state: 'planned', replayed: true } })
    expect(runs).toBe(1)
    expect(await testDb()('benches').where({ name: tag }).count({ n: '*' })).toEqual([{ n: 0 }])
  })

  it('binds the id: another row, step or person is a 409 and runs nothing', async () => {
    const id = randomUUID()
    let runs = 0
    const work = async () => ({ result: { run: ++runs } })
    await runOnce(caster, id, { kind: 'pour.poured', entityId: 9 }, work)
    await expect(runOnce(caster, id, { kind: 'pour.poured', entityId: 10 }, work)).rejects.toMatchObject({ statusCode: 409, data: { mismatch: 'entity' } })
    await expect(runOnce(caster, id, { kind: 'pour.demoulded', entityId: 9 }, work)).rejects.toMatchObject({ statusCode: 409, data: { mismatch: 'step' } })
    await expect(runOnce(other, id, { kind: 'pour.poured', entityId: 9 }, work)).rejects.toMatchObject({ statusCode: 409, data: { mismatch: 'person' } })
    expect(runs).toBe(1)
  })
})
