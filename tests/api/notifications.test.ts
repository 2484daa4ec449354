// E-mail notifications through the outbox: recipients, preferences (GET/PATCH
// /api/me/notifications), the overdue-demould check, and a retry after the SMTP fake refuses.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { call, signIn, waitForMail } from '../setup/http'
import { DEMO_PASSWORD, closeTestDb, demo, demoWorkshopId, makeUser, testDb } from '../setup/fixtures'
import { boardFixture } from '../setup/board-fixtures'
import { jpegWithGps, photoForm } from '../setup/photo-fixtures'

let lead = ''
let ws = 0
const uid = () => Math.random().toString(36).slice(2, 8).toUpperCase()

beforeAll(async () => {
  lead = await signIn(demo.lead.email, DEMO_PASSWORD)
  ws = await demoWorkshopId()
})
afterAll(closeTestDb)

/** A job needing a sample, with the given client users as members. */
async function sampleJob(members: number[]) {
  const job = (await call('/api/jobs', { method: 'POST', cookie: lead, body: { code: `N-${uid()}`, title: 'Notify job', sampleRequired: true } })).data
  for (const m of members) await testDb()('job_members').insert({ workshop_id: ws, job_id: job.id, user_id: m })
  return job as { id: number; code: string; version: number }
}
const outbox = (where: Record<string, unknown>) => testDb()('mail_outbox').where(where).select('id', 'to_email', 'kind', 'status', 'attempts', 'dedupe_key')

describe('notification preferences', () => {
  it('every kind is on by default; PATCH turns one off and answers every flag; bad bodies are 422 naming the field', async () => {
    const u = await makeUser(ws, 'client', 'prefs')
    const c = await signIn(u.email, DEMO_PASSWORD)
    const got = await call('/api/me/notifications', { cookie: c })
    expect(got.status).toBe(200)
    expect(Object.values(got.data).every(v => v === true)).toBe(true)
    const off = await call('/api/me/notifications', { method: 'PATCH', cookie: c, body: { photos_shared: false } })
    expect(off.data).toMatchObject({ photos_shared: false, sample_ready: true, job_ready: true })
    expect((await call('/api/me/notifications', { cookie: c })).data.photos_shared).toBe(false)
    const bad = await call('/api/me/notifications', { method: 'PATCH', cookie: c, body: { sample_ready: 'no' } })
    expect(bad.status).toBe(422)
    expect(bad.data.data.problems[0].field).toBe('sample_ready')
    expect((await call('/api/me/notifications', { method: 'PATCH', cookie: c, body: { spam: true } })).status).toBe(422)
    expect((await call('/api/me/notifications')).status).toBe(401)
  })
})

describe('notifications', () => {
  it('sample ready reaches each client member who has it on, and not one who turned it off', async () => {
    const on = await makeUser(ws, 'client', 'notify-on')
    const off = await makeUser(ws, 'client', 'notify-off')
    await call('/api/me/notifications', { method: 'PATCH', cookie: await signIn(off.email, DEMO_PASSWORD), body: { sample_ready: false } })
    const job = await sampleJob([on.id, off.id])
    const r = await call(`/api/jobs/${job.id}/sample`, { method: 'POST', cookie: lead, body: { state: 'awaiting_approval', version: job.version } })
    expect(r.status).toBe(200)
    const mail = await waitForMail(lead, on.email, job.code)
    expect(mail.subject).toContain('Sample ready')
    expect(await outbox({ to_email: off.email })).toEqual([])
  })

  it('a sample decision reaches the leads who have it on', async () => {
    const client = await makeUser(ws, 'client', 'decider')
    const quietLead = await makeUser(ws, 'lead', 'quiet-lead')
    await call('/api/me/notifications', { method: 'PATCH', cookie: await signIn(quietLead.email, DEMO_PASSWORD), body: { sample_decision: false } })
    const job = await sampleJob([client.id])
    await call(`/api/jobs/${job.id}/sample`, { method: 'POST', cookie: lead, body: { state: 'awaiting_approval', version: job.version } })
    const d = await call(`/api/jobs/${job.id}/sample-decision`, { method: 'POST', cookie: await signIn(client.email, DEMO_PASSWORD), body: { decision: 'changes_requested', comment: 'Deeper fillet' } })
    expect(d.status).toBe(200)
    const mail = await waitForMail(lead, demo.lead.email, `${job.code}: Fixture decider asked for changes`)
    expect(mail.text).toContain('Deeper fillet')
    expect(await outbox({ to_email: quietLead.email, kind: 'sample_decision' })).toEqual([])
  })

  it('shared photos reach the job\'s clients once per job and day: not while unshared, once when shared, batched after', async () => {
    const member = await makeUser(ws, 'client', 'photos')
    const job = (await call('/api/jobs', { method: 'POST', cookie: lead, body: { code: `P-${uid()}`, title: 'Photo job' } })).data as { id: number; code: string }
    await testDb()('job_members').insert({ workshop_id: ws, job_id: job.id, user_id: member.id })
    const jpeg = await jpegWithGps(640, 480)
    const upload = (fields: Record<string, string>) => call(`/api/jobs/${job.id}/photos`, { method: 'POST', cookie: lead, form: photoForm([{ name: 'rose.jpg', data: jpeg }], fields) })
    const hidden = await upload({ caption: 'Not yet' })
    expect(hidden.status).toBe(201)
    expect(await outbox({ to_email: member.email })).toEqual([])
    const shared = await call(`/api/photos/${hidden.data[0].id}`, { method: 'PATCH', cookie: lead, body: { shared: true } })
    expect(shared.status).toBe(200)
    const mail = await waitForMail(lead, member.email, `New photos of ${job.code}`)
    expect(mail.text).toContain(`/client/jobs/${job.id}`)
    // a second shared photo the same day is absorbed into the first mail
    expect((await upload({ shared: 'true' })).status).toBe(201)
    expect(await outbox({ to_email: member.email, kind: 'photos_shared' })).toHaveLength(1)
  })

  it('the outbox retries after the SMTP fake refuses once: attempts ≥ 2, then sent', async () => {
    // the fake refuses whichever message comes next; if another test's mail took the refusal,
    // try again with a fresh job (at most three rounds)
    let row: { status: string; kind: string; attempts: number } | undefined
    for (let round = 0; round < 3 && !(row && row.attempts >= 2); round++) {
      const member = await makeUser(ws, 'client', 'retry')
      const job = await sampleJob([member.id])
      expect((await call('/api/dev/mails/refuse', { method: 'POST', cookie: lead, body: { count: 1 } })).data).toEqual({ refusing: 1 })
      await call(`/api/jobs/${job.id}/sample`, { method: 'POST', cookie: lead, body: { state: 'awaiting_approval', version: job.version } })
      await waitForMail(lead, member.email, job.code)
      row = (await outbox({ to_email: member.email }))[0]
    }
    expect(row).toMatchObject({ status: 'sent', kind: 'sample_ready' })
    expect(row!.attempts).toBeGreaterThanOrEqual(2)
    expect((await call('/api/dev/mails/refuse', { method: 'POST', cookie: lead, body: { count: -1 } })).status).toBe(422)
  })

  it('an overdue demould mails the leads once per pour', async () => {
    const fx = await boardFixture('overdue')
    const mould = await fx.mould()
    const at = (min: number) => new Date(Date.now() + min * 60_000).toISOString()
    const overduePour = async (mouldId: number) => (await fx.k('pours').insert({
      workshop_id: ws, mould_id: mouldId, grade_id: fx.gradeId, consistency: 70, state: 'setting',
      slot: fx.k.raw('tstzrange(?, ?)', [at(-120), at(-10)]), mix_at: at(-110), demould_open_at: at(-80), demould_close_at: at(-40),
      plaster_kg_planned: 2, water_kg_planned: 1.4,
    }).returning('id'))[0].id as number
    const codeOf = async (mouldId: number) => (await fx.k('moulds').where({ id: mouldId }).first('code')).code as string
    const pour = await overduePour(mould)
    await waitForMail(lead, demo.lead.email, `Overdue demould: mould ${await codeOf(mould)}`)
    // a second overdue pour's mail proves that the check ran again after the first one's
    const laterMould = await fx.mould()
    const later = await overduePour(laterMould)
    await waitForMail(lead, demo.lead.email, `Overdue demould: mould ${await codeOf(laterMould)}`)
    const rows = await fx.k('mail_outbox').where('dedupe_key', 'like', `overdue:${pour}:%`).select('to_email')
    expect(rows.filter((r: { to_email: string }) => r.to_email === demo.lead.email)).toHaveLength(1)
    await fx.k('pours').whereIn('id', [pour, later]).update({ state: 'void', void_reason: 'test done' })
  })
})
