// The sample cast round. The lead marks the sample cast (awaiting_cast) or ready for approval
// (awaiting_approval: the job's client members get an e-mail); a client member approves or
// asks for changes with a comment (the lead gets an e-mail). Each step is written to the
// register. The sample's photo arrives with the photos issue.
import type { Knex } from 'knex'
import type { Actor } from '../utils/auth'
import { jobsRepo, type JobRow } from '../repos/jobs'
import { recordEvent } from '../repos/events'

function jobLink(job: JobRow, path: string) {
  return `${appEnv().APP_URL}${path}/${job.id}`
}

async function mailMembers(trx: Knex, actor: Actor, job: JobRow) {
  const members = await jobsRepo.members(trx, actor.workshopId, job.id)
  for (const m of members) {
    await queueMail(trx, {
      workshopId: actor.workshopId, userId: m.id, to: m.email, kind: 'sample_ready',
      subject: `Sample ready for your approval: ${job.code} ${job.title}`,
      text: [`Hello ${m.name},`, '', `The sample cast for ${job.code} (${job.title}) is ready for your approval.`,
        'Approve it, or ask for changes with a comment, here:', jobLink(job, '/client/jobs'), '',
        'The rest of the job goes on the casting board once you approve the sample.'].join('\n'),
      dedupeKey: `sample-ready:${job.id}:${job.version}:${m.id}`,
    })
  }
}

export async function markSample(actor: Actor, jobId: number, input: { state: 'awaiting_cast' | 'awaiting_approval'; version: number }) {
  const job = await useDb().transaction(async (trx) => {
    const before = await jobsRepo.byId(trx, actor.workshopId, jobId)
    if (!before) notFound('Job')
    if (!before.sample_required) conflict('This job does not require a sample')
    if (before.sample_state === 'approved') conflict('The client has already approved the sample')
    const row = await jobsRepo.update(trx, actor.workshopId, jobId, input.version, { sampleState: input.state })
    await recordEvent(trx, { workshopId: actor.workshopId, entity: 'job', entityId: jobId, type: `sample.${input.state}`, actorId: actor.id, data: { from: before.sample_state } })
    if (input.state === 'awaiting_approval') await mailMembers(trx, actor, row)
    return row
  })
  void deliverDueMail().catch(() => undefined)
  return job
}

async function mailLeads(trx: Knex, actor: Actor, job: JobRow, decision: string, comment: string | null) {
  const leads: { id: number; email: string; name: string }[] = await trx('users').select('id', 'email', 'name')
    .where({ workshop_id: actor.workshopId, role: 'lead' }).whereNull('disabled_at')
  const verdict = decision === 'approved' ? 'approved the sample' : 'asked for changes to the sample'
  for (const lead of leads) {
    await queueMail(trx, {
      workshopId: actor.workshopId, userId: lead.id, to: lead.email, kind: `sample_${decision}`,
      subject: `${job.code}: ${actor.name} ${verdict}`,
      text: [`Hello ${lead.name},`, '', `${actor.name} ${verdict} for ${job.code} (${job.title}).`,
        comment ? `Their comment: ${comment}` : 'They left no comment.', '', jobLink(job, '/lead/jobs')].join('\n'),
    })
  }
}

export async function decideSample(actor: Actor, jobId: number, input: { decision: 'approved' | 'changes_requested'; comment?: string | null }) {
  const db = useDb()
  const job = await jobsRepo.byId(db, actor.workshopId, jobId)
  if (!job || !(await jobsRepo.isMember(db, actor.workshopId, jobId, actor.id))) notFound('Job')
  const row = await db.transaction(async (trx) => {
    const [updated] = await jobsRepo.decideSample(trx, actor.workshopId, jobId, { decision: input.decision, comment: input.comment ?? null, userId: actor.id })
    if (!updated) conflict('The sample is not waiting for your approval')
    await recordEvent(trx, { workshopId: actor.workshopId, entity: 'job', entityId: jobId, type: `sample.${input.decision}`, actorId: actor.id, data: { comment: input.comment ?? null } })
    await mailLeads(trx, actor, updated, input.decision, input.comment ?? null)
    return updated
  })
  void deliverDueMail().catch(() => undefined)
  return { id: row.id, sample_state: row.sample_state, sample_comment: row.sample_comment, sample_decided_at: row.sample_decided_at, released: jobReleased(row) }
}
