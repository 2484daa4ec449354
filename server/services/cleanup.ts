// The nightly clean-up (a background job, server/utils/jobs.ts): rows whose use is over.
// - sent mail after SENT_MAIL_KEEP_DAYS (90 by default), and mail failed for good as long
//   after it was queued: a lead looking into a missing mail does so within weeks (common practice);
// - answered tablet actions after ACTIONS_KEEP_DAYS (30): a tablet's outbox replays within
//   hours of going offline, so a month is far beyond any replay;
// - rate-limit counters whose window has ended.
// The register (events, pours, pieces) is never cleaned: it is the workshop's record.
import { mailOutboxRepo } from '../repos/mail-outbox'
import { processedActionsRepo } from '../repos/processed-actions'
import { rateLimitsRepo } from '../repos/rate-limits'

export interface CleanupResult { mail: number; actions: number; limits: number }

export async function cleanUpOldRows(db = useDb()): Promise<CleanupResult> {
  const env = appEnv()
  return db.transaction(async trx => ({
    mail: await mailOutboxRepo.deleteOld(trx, env.SENT_MAIL_KEEP_DAYS),
    actions: await processedActionsRepo.deleteOld(trx, env.ACTIONS_KEEP_DAYS),
    limits: await rateLimitsRepo.deleteExpired(trx),
  }))
}
