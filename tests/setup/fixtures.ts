// Database fixtures for API tests: a second workshop (tenancy), throwaway users.
import knex, { type Knex } from 'knex'
import { Hash } from '@adonisjs/hash'
import { Scrypt } from '@adonisjs/hash/drivers/scrypt'
import { randomUUID } from 'node:crypto'
import { scryptOptions } from '../../server/utils/password-policy'
import { DEMO_PASSWORD, DEMO_USERS } from '../../db/seeds/demo-people'
import { testDatabaseUrl } from './context'

export { DEMO_PASSWORD }
export const demo = Object.fromEntries(DEMO_USERS.map(u => [u.key, u])) as Record<(typeof DEMO_USERS)[number]['key'], (typeof DEMO_USERS)[number]>

let db: Knex | undefined
export function testDb(): Knex {
  db ??= knex({ client: 'pg', connection: testDatabaseUrl(), pool: { min: 0, max: 2 } })
  return db
}
export async function closeTestDb() {
  await db?.destroy()
  db = undefined
}

let demoHash: Promise<string> | undefined
/** The hash of DEMO_PASSWORD, computed once per file (scrypt at N = 2^17 is slow on purpose). */
export function passwordHash() {
  demoHash ??= new Hash(new Scrypt(scryptOptions())).make(DEMO_PASSWORD)
  return demoHash
}

export async function demoWorkshopId() {
  const row = await testDb()('users').where({ email: demo.lead.email }).first('workshop_id')
  return Number(row.workshop_id)
}

/** A user in a workshop, with DEMO_PASSWORD; e-mail made unique per call. */
export async function makeUser(workshopId: number, role: 'lead' | 'caster' | 'finisher' | 'client', label: string = role) {
  const email = `${label}-${randomUUID().slice(0, 8)}@fixture.example.test`
  const [row] = await testDb()('users').insert({
    workshop_id: workshopId, email, name: `Fixture ${label}`, role, password_hash: await passwordHash(),
  }).returning(['id', 'email'])
  return { id: Number(row.id), email: row.email as string }
}

/** A second workshop with a lead, a caster, a client and one job the client is on. */
export async function makeOtherWorkshop() {
  const k = testDb()
  const [ws] = await k('workshops').insert({ name: `Other workshop ${randomUUID().slice(0, 6)}` }).returning('id')
  const workshopId = Number(ws.id)
  const lead = await makeUser(workshopId, 'lead', 'other-lead')
  const caster = await makeUser(workshopId, 'caster', 'other-caster')
  const client = await makeUser(workshopId, 'client', 'other-client')
  const [job] = await k('jobs').insert({ workshop_id: workshopId, code: 'X-1', title: 'Other job' }).returning('id')
  await k('job_members').insert({ workshop_id: workshopId, job_id: job.id, user_id: client.id })
  return { workshopId, lead, caster, client, jobId: Number(job.id) }
}

const pinHashes = new Map<string, Promise<string>>()
/** Sets a user's tablet PIN straight in the database (hashed as the server hashes it, once per PIN and file). */
export async function setPinDirect(userId: number, pin: string) {
  if (!pinHashes.has(pin)) pinHashes.set(pin, new Hash(new Scrypt(scryptOptions())).make(pin))
  await testDb()('users').where({ id: userId }).update({ pin_hash: await pinHashes.get(pin)! })
}
