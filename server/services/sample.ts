// The sample cast round. The lead marks the sample cast (awaiting_cast) or ready for approval
// (awaiting_approval: the job's client members get an e-mail); a client member approves or
// asks for changes with a comment (the lead gets an e-mail). Each step is written to the
// register. The sample's photo arrives with the photos issue.
import type { Actor } from '../utils/auth'
import { jobsRepo } from '../repos/jobs'
import { toJob } from './jobs'
import type { Job, SampleDecisionResult } from '#shared/types/jobs'
import { recordEvent } from '../repos/events'
import { notifySampleDecision, notifySampleReady } from './notify'

export async function markSample(actor: Actor, jobId: number, input: { state: 'awaiting_cast' | 'awaiting_approval'; version: number }): Promise<Job> {
  const job = await useDb().transaction(async (trx) => {
    const before = await jobsRepo.byId(trx, actor.workshopId, jobId)
    if (!before) notFound('Job')
    if (!before.sample_required) conflict('This job does not require a sample')
    if (before.sample_state === 'approved') conflict('The client has already approved the sample')
    const row = await jobsRepo.update(trx, actor.workshopId, jobId, input.version, { sampleState: input.state })
    await recordEvent(trx, { workshopId: actor.workshopId, entity: 'job', entityId: jobId, type: `sample.${input.state}`, actorId: actor.id, data: { from: before.sample_state } })
    if (input.state === 'awaiting_approval') await notifySampleReady(trx, actor.workshopId, row)
    return row
  })
  void deliverDueMail().catch(() => undefined)
  return toJob(job)
}

export async function decideSample(actor: Actor, jobId: number, input: { decision: 'approved' | 'changes_requested'; comment?: string | null }): Promise<SampleDecisionResult> {
  const db = useDb()
  const job = await jobsRepo.byId(db, actor.workshopId, jobId)
  if (!job || !(await jobsRepo.isMember(db, actor.workshopId, jobId, actor.id))) notFound('Job')
  const row = await db.transaction(async (trx) => {
    const [updated] = await jobsRepo.decideSample(trx, actor.workshopId, jobId, { decision: input.decision, comment: input.comment ?? null, userId: actor.id })
    if (!updated) conflict('The sample is not waiting for your approval')
    await recordEvent(trx, { workshopId: actor.workshopId, entity: 'job', entityId: jobId, type: `sample.${input.decision}`, actorId: actor.id, data: { comment: input.comment ?? null } })
    await notifySampleDecision(trx, actor.workshopId, { job: updated, clientName: actor.name, decision: input.decision, comment: input.comment ?? null, decidedAt: new Date(updated.sample_decided_at ?? Date.now()) })
    return updated
  })
  void deliverDueMail().catch(() => undefined)
  return { id: row.id, sampleState: row.sample_state, sampleComment: row.sample_comment, sampleDecidedAt: row.sample_decided_at?.toISOString() ?? null, released: jobReleased(row) }
}
