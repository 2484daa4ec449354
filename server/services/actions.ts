// Exactly-once actions: a tablet gives every action a UUID and may send it again and again
// (an outbox replays after a Wi-Fi drop without knowing whether the first copy landed). The
// first answer is stored in processed_actions in the same transaction as the change; any
// replay gets that answer back with the same status and changes nothing. A refusal (409, or
// a 422 about the data's meaning) is stored too, so its replay is refused the same way.
// Idempotency keys stored with the response: common practice for retried writes
// (the IETF httpapi draft "The Idempotency-Key HTTP Header Field").
import type { Knex } from 'knex'
import type { Actor } from '../utils/auth'
import { processedActionsRepo } from '../repos/processed-actions'

const MINUTE_MS = 60_000
/** A tablet's clock may run a little ahead of the server's: two minutes of grace (common practice). */
const CLOCK_SKEW_MS = 2 * MINUTE_MS
/** An action recorded more than a minute after it happened counts as back-dated. */
const BACKDATED_AFTER_MS = MINUTE_MS
/**
 * How far back a step may be dated: a year (366 days). A tablet's outbox holds steps for hours
 * or days of lost Wi-Fi and a lead records a late dispatch or a holiday's demoulds afterwards;
 * anything older is a typing slip (a year of 1000 or 2025 for 2026) that would file the step
 * under the wrong year, and with it a dispatch note's number (DN-<year>-…).
 */
export const ACTION_MAX_AGE_MS = 366 * 24 * 60 * MINUTE_MS

/**
 * When a tablet action happened: now, or the real time the user entered (`at`, ISO), never
 * ahead of the server's clock (beyond CLOCK_SKEW_MS), never more than ACTION_MAX_AGE_MS back
 * and never before the entity's previous step. Kept as back-dated
 * when more than a minute old (the register shows it as recorded late).
 */
export function actionTime(atIso: string | undefined, previous: Date | null) {
  const now = Date.now()
  const at = atIso ? new Date(atIso) : new Date(now)
  if (at.getTime() > now + CLOCK_SKEW_MS) unprocessable([{ field: 'at', message: 'at cannot be in the future' }])
  if (at.getTime() < now - ACTION_MAX_AGE_MS) unprocessable([{ field: 'at', message: 'at must be within the last year' }])
  if (previous && at.getTime() < previous.getTime()) unprocessable([{ field: 'at', message: `at must be after the previous step (${previous.toISOString()})` }])
  return { at, backdated: now - at.getTime() > BACKDATED_AFTER_MS }
}

export interface ActionOutcome<T> {
  /** The body to answer with (stored for replays). */
  result: T
  /** Runs after commit, only the first time (live events). */
  after?: () => void
}

export interface ActionAnswer<T> { status: number; result: T; replayed: boolean }

/** Statuses whose answer is stored: success and refusals about the action's meaning. */
const STORED_REFUSALS = new Set([409, 422])

interface HttpishError { statusCode?: number; message?: string; data?: unknown }

function refusalBody(e: HttpishError) {
  return { statusCode: e.statusCode, message: e.message, data: e.data ?? null }
}

/** Throws the stored refusal again, as the first answer was thrown. */
function rethrowStored(status: number, result: unknown): never {
  const r = (result ?? {}) as { message?: string; data?: Record<string, unknown> | null }
  throw createError({ statusCode: status, message: r.message ?? 'This action was refused', data: { ...(r.data ?? {}), replayed: true } })
}

/** What an action id is bound to: the step (`pour.poured`, `dispatch.create`…) and the row it acts on. */
export interface ActionTarget {
  kind: string
  /** The pour, the piece, or the job of a dispatch note. */
  entityId: number
}

const NEW_ID = 'the tablet must make a new one for this step'

/**
 * The stored answer for an action id. Only a true replay gets it: the same workshop, person,
 * step and row. An id reused for anything else is a 409 that says so and changes nothing (an
 * idempotency key used with a different request is an error, not a replay: IETF httpapi draft
 * "The Idempotency-Key HTTP Header Field": a key reused with another payload is refused).
 */
function replay<T>(actor: Actor, target: ActionTarget, found: NonNullable<Awaited<ReturnType<typeof processedActionsRepo.find>>>): ActionAnswer<T> {
  if (found.workshop_id !== actor.workshopId) conflict(`This action id was already used; ${NEW_ID}`, { mismatch: 'workshop' })
  if (found.user_id !== actor.id) conflict(`This action id was already used by another person; ${NEW_ID}`, { mismatch: 'person' })
  if (found.kind !== target.kind) conflict(`This action id was already used for another step (${found.kind.replace('.', ': ').replace('_', ' ')}); ${NEW_ID}`, { mismatch: 'step' })
  if (found.entity_id !== null && found.entity_id !== target.entityId) {
    const what = found.kind.startsWith('dispatch.') ? 'job' : found.kind.split('.')[0]
    conflict(`This action id was already used for another step, on another ${what}; ${NEW_ID}`, { mismatch: 'entity' })
  }
  if (found.status >= 400) rethrowStored(found.status, found.result)
  return { status: found.status, result: found.result as T, replayed: true }
}

/**
 * The stored answer of an action id already answered (or its refusal thrown again, or a 409
 * when the id was used for something else); undefined when the id is new. A look without the
 * lock, for work that is costly before its transaction (a photo upload decodes its images
 * first): a replay is answered at once, and `runOnce` still decides a race between two copies.
 */
export async function answeredAction<T>(actor: Actor, actionId: string, target: ActionTarget): Promise<ActionAnswer<T> | undefined> {
  const found = await processedActionsRepo.find(useDb(), actionId)
  return found ? replay<T>(actor, target, found) : undefined
}

/**
 * Runs `work` once per action id inside one transaction, with the id's answer recorded in it.
 * A stored answer is returned (or its refusal thrown again) instead of running `work`, when the
 * id was used by the same person for the same step on the same row (`target`); otherwise a 409.
 */
export async function runOnce<T>(actor: Actor, actionId: string, target: ActionTarget, work: (trx: Knex.Transaction) => Promise<ActionOutcome<T>>): Promise<ActionAnswer<T>> {
  const db = useDb()
  let outcome: ActionOutcome<T> | undefined
  let refusal: HttpishError | undefined
  const answer = await db.transaction(async (trx): Promise<ActionAnswer<T>> => {
    await processedActionsRepo.lock(trx, actionId)
    const found = await processedActionsRepo.find(trx, actionId)
    if (found) return replay<T>(actor, target, found)
    try {
      // a savepoint: a refused action leaves nothing behind but its stored refusal
      outcome = await trx.transaction(inner => work(inner))
    }
    catch (thrown) {
      const e = asHttpError(thrown)
      const status = (e as HttpishError)?.statusCode
      if (!status || !STORED_REFUSALS.has(status)) throw e
      refusal = e as HttpishError
      await processedActionsRepo.insert(trx, { id: actionId, workshopId: actor.workshopId, userId: actor.id, kind: target.kind, entityId: target.entityId, status, result: refusalBody(refusal) })
      return { status, result: undefined as T, replayed: false }
    }
    await processedActionsRepo.insert(trx, { id: actionId, workshopId: actor.workshopId, userId: actor.id, kind: target.kind, entityId: target.entityId, status: 200, result: outcome.result })
    return { status: 200, result: outcome.result, replayed: false }
  })
  if (refusal) throw refusal
  outcome?.after?.()
  return answer
}
