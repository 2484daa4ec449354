// The session checks of one turn of the event loop go to PostgreSQL as one query
// (server/utils/session-checks.ts): each request still gets its own answer, in its own order,
// and a sign-out committed before a request arrives fails that request's check.
import { createHash, randomBytes } from 'node:crypto'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { demo, testDb } from '../setup/fixtures'
import { checkJobMember, checkSessionUser, checkTablet } from '../../server/utils/session-checks'
import { userSessionsRepo } from '../../server/repos/user-sessions'
import { closeDb, useDb } from '../../server/utils/db'

const sha = (s: string) => createHash('sha256').update(s).digest('hex')
let caster: { id: number; workshop_id: number }
let lead: { id: number; workshop_id: number }
const tokens = { caster: randomBytes(16).toString('hex'), lead: randomBytes(16).toString('hex'), ended: randomBytes(16).toString('hex') }

beforeAll(async () => {
  const k = testDb()
  caster = await k('users').where({ email: demo.caster1.email }).first('id', 'workshop_id')
  lead = await k('users').where({ email: demo.lead.email }).first('id', 'workshop_id')
  for (const [who, token] of [[caster, tokens.caster], [lead, tokens.lead], [caster, tokens.ended]] as const) {
    await userSessionsRepo.start(useDb(), { workshop_id: who.workshop_id, user_id: who.id, token_hash: sha(token), tablet_id: null }, 3600)
  }
  await userSessionsRepo.end(useDb(), sha(tokens.ended))
})
afterAll(async () => {
  await closeDb()
})

/** Counts the queries sent while `fn` runs (knex's query event). */
async function countingQueries<T>(fn: () => Promise<T>): Promise<{ result: T; queries: number }> {
  let queries = 0
  const count = () => queries++
  useDb().on('query', count)
  try {
    return { result: await fn(), queries }
  }
  finally {
    useDb().off('query', count)
  }
}

describe('session checks, batched per turn', () => {
  it('answers each check of one turn from one query, in the order asked', async () => {
    const key = (who: typeof caster, token: string) => ({ workshopId: who.workshop_id, userId: who.id, tokenHash: sha(token) })
    const { result, queries } = await countingQueries(() => Promise.all([
      checkSessionUser(key(caster, tokens.caster)),
      checkSessionUser(key(lead, tokens.lead)),
      // the caster's token presented for the lead: the lead is found, with no live session
      checkSessionUser(key(lead, tokens.caster)),
      checkSessionUser(key(caster, tokens.ended)),
      checkSessionUser({ workshopId: caster.workshop_id, userId: 987_654_321, tokenHash: sha(tokens.caster) }),
      checkSessionUser(key(caster, tokens.caster)),
    ]))
    expect(queries).toBe(1)
    expect(result.map(r => r && { id: r.id, live: r.session_id !== null })).toEqual([
      { id: caster.id, live: true },
      { id: lead.id, live: true },
      { id: lead.id, live: false },
      { id: caster.id, live: false },
      undefined,
      { id: caster.id, live: true },
    ])
    expect(result[0]!.session_expires_at).toBeInstanceOf(Date)
  })

  it('never answers a check from an earlier one: a sign-out between two turns fails the second', async () => {
    const token = randomBytes(16).toString('hex')
    await userSessionsRepo.start(useDb(), { workshop_id: caster.workshop_id, user_id: caster.id, token_hash: sha(token), tablet_id: null }, 3600)
    const key = { workshopId: caster.workshop_id, userId: caster.id, tokenHash: sha(token) }
    expect((await checkSessionUser(key))?.session_id).not.toBeNull()
    await userSessionsRepo.end(useDb(), sha(token))
    expect((await checkSessionUser(key))?.session_id).toBeNull()
  })

  it('reads the tablets of one turn in one query, each token to its own device', async () => {
    const k = testDb()
    const [a, b] = [randomBytes(16).toString('hex'), randomBytes(16).toString('hex')]
    const [ta] = await k('tablet_devices').insert({ workshop_id: lead.workshop_id, name: 'Check tablet A', token_hash: sha(a), signed_in_by: lead.id }).returning('id')
    const [tb] = await k('tablet_devices').insert({ workshop_id: lead.workshop_id, name: 'Check tablet B', token_hash: sha(b), signed_in_by: lead.id, revoked_at: new Date() }).returning('id')
    const { result, queries } = await countingQueries(() => Promise.all([checkTablet(sha(b)), checkTablet(sha('unknown')), checkTablet(sha(a)), checkTablet(sha(a))]))
    expect(queries).toBe(1)
    expect(result.map(r => r && { id: Number(r.id), revoked: r.revoked_at !== null })).toEqual([
      { id: Number(tb.id), revoked: true }, undefined, { id: Number(ta.id), revoked: false }, { id: Number(ta.id), revoked: false },
    ])
  })

  it('checks the job memberships of one turn in one query, each against its own workshop, job and person', async () => {
    const k = testDb()
    const client = await k('users').where({ email: demo.client1.email }).first('id', 'workshop_id')
    const mine = k('job_members').where({ user_id: client.id }).select('job_id')
    const member = (await k('jobs').whereIn('id', mine).orderBy('id').first('id')).id
    const other = (await k('jobs').where({ workshop_id: client.workshop_id }).whereNotIn('id', mine).orderBy('id').first('id')).id
    const key = (jobId: number, userId = Number(client.id), workshopId = Number(client.workshop_id)) => ({ workshopId, jobId: Number(jobId), userId })
    try {
      const { result, queries } = await countingQueries(() => Promise.all([
        checkJobMember(key(member)),
        checkJobMember(key(other)),
        // the member's job asked for another person, and in another workshop
        checkJobMember(key(member, lead.id)),
        checkJobMember(key(member, Number(client.id), 987_654_321)),
        checkJobMember(key(member)),
      ]))
      expect(queries).toBe(1)
      expect(result).toEqual([true, false, false, false, true])
      // nothing kept: taken off the job between two turns, the second check fails
      await k('job_members').where({ job_id: member, user_id: client.id }).del()
      expect(await checkJobMember(key(member))).toBe(false)
    }
    finally {
      await k('job_members').insert({ workshop_id: client.workshop_id, job_id: member, user_id: client.id }).onConflict().ignore()
    }
  })
})
