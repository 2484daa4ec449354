// A job's client mail carries the job page's link only for those who can open it: a contact
// who is a client member of the job gets it; a contact without a Setline account (or one not
// on this job) gets the news without a link that would answer "not found", and is told the
// workshop can invite them (server/services/notify.ts says why no invitation is sent by itself).
import { describe, expect, it } from 'vitest'
import { randomUUID } from 'node:crypto'
import { demoWorkshopId, makeUser, testDb } from '../setup/fixtures'
import { notifyJobReady, notifyPhotosShared, notifySampleReady } from '../../server/services/notify'

async function jobWithContacts() {
  const k = testDb()
  const ws = await demoWorkshopId()
  const tag = randomUUID().slice(0, 6)
  const [org] = await k('client_orgs').insert({ workshop_id: ws, name: `Contacts ${tag}` }).returning('id')
  const [job] = await k('jobs').insert({ workshop_id: ws, code: `CL-${tag}`, title: 'Cornice run (invented)', client_org_id: org.id }).returning(['id', 'code', 'title', 'version'])
  const member = await makeUser(ws, 'client', `member-${tag}`)
  const notOnJob = await makeUser(ws, 'client', `other-${tag}`)
  await k('job_members').insert({ workshop_id: ws, job_id: job.id, user_id: member.id })
  const plain = `plain-${tag}@contact.example.test`
  await k('client_contacts').insert([member.email, notOnJob.email, plain].map((email, i) => ({ workshop_id: ws, client_org_id: org.id, name: `Contact ${i}`, email })))
  return { ws, job: { id: Number(job.id), code: job.code as string, title: job.title as string, version: Number(job.version) }, member: member.email, notOnJob: notOnJob.email, plain }
}

const mailTo = (to: string, kind: string) => testDb()('mail_outbox').where({ to_email: to, kind }).first('text')

describe('job mail links follow who can open the job page', () => {
  it('photos, sample and ready mail: the member gets the link, the others get the news and how to get access', async () => {
    const f = await jobWithContacts()
    await testDb().transaction(async (trx) => {
      await notifyPhotosShared(trx, f.ws, f.job.id)
      await notifySampleReady(trx, f.ws, f.job)
      await notifyJobReady(trx, f.ws, f.job.id)
    })
    const page = `/client/jobs/${f.job.id}`
    for (const kind of ['photos_shared', 'sample_ready', 'job_ready']) {
      const member = await mailTo(f.member, kind)
      expect(member?.text, kind).toContain(page)
      expect(member?.text, kind).not.toMatch(/invite you/)
      for (const other of [f.plain, f.notOnJob]) {
        const m = await mailTo(other, kind)
        expect(m, `${kind} to ${other}`).toBeTruthy()
        expect(m!.text).toContain(f.job.code)
        expect(m!.text).not.toContain('/client/jobs/')
        expect(m!.text).toContain('ask the workshop to invite you')
      }
    }
  })
})
