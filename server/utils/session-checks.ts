// Every request checks its session in the database: a session signed out, expired or taken
// away must fail on its next request, on every instance (server/utils/auth.ts). Under load,
// many such checks arrive in the same turn of the event loop (every tablet reads its day again
// on each live event); they go to PostgreSQL as one query instead of one each (DataLoader,
// batched per turn: setImmediate runs after the turn's incoming requests were read).
// Nothing is cached: a check is never answered from an earlier one, and its query leaves after
// its request arrived, so it sees every sign-out committed before that.
import DataLoader from 'dataloader'
import { userSessionsRepo, type SessionUserRow } from '../repos/user-sessions'
import { tabletsRepo, type TabletRow } from '../repos/tablets'
import { jobsRepo } from '../repos/jobs'

export interface SessionKey { workshopId: number; userId: number; tokenHash: string }

/** One batch per turn, at most this many keys (the query's arrays stay small). */
const MAX_BATCH = 256
const options = { cache: false, maxBatchSize: MAX_BATCH, batchScheduleFn: (run: () => void) => setImmediate(run) } as const

let users: DataLoader<SessionKey, SessionUserRow | undefined> | undefined
let tablets: DataLoader<string, TabletRow | undefined> | undefined
let members: DataLoader<JobMemberKey, boolean> | undefined

export interface JobMemberKey { workshopId: number; jobId: number; userId: number }

/** The user of a session and whether the session is live (userSessionsRepo.usersOfSessions), checked with the turn's others. */
export function checkSessionUser(key: SessionKey): Promise<SessionUserRow | undefined> {
  users ??= new DataLoader(keys => userSessionsRepo.usersOfSessions(useDb(), keys), options)
  return users.load(key)
}

/** The tablet a device token's hash belongs to, revoked or not (tabletsRepo.byTokenHash), read with the turn's others. */
export function checkTablet(tokenHash: string): Promise<TabletRow | undefined> {
  tablets ??= new DataLoader(hashes => tabletsRepo.byTokenHashes(useDb(), hashes), options)
  return tablets.load(tokenHash)
}

/**
 * Whether a client is a member of a job (jobsRepo.areMembers), checked with the turn's others:
 * every member of a job reads its progress again on each of the job's live events.
 */
export function checkJobMember(key: JobMemberKey): Promise<boolean> {
  members ??= new DataLoader(keys => jobsRepo.areMembers(useDb(), keys), options)
  return members.load(key)
}
