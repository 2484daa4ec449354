// Who may send which outbox entry (pure, so the rules are tested without a browser). A step is
// recorded in the register under the session that sends it, so an entry goes out only under
// the session of the person who tapped it: on a shared tablet the next person's session must
// never carry the previous person's steps (OWASP ASVS 4.0.3 V3.3: a session ends with its
// person; V4.1.3: act with the least privilege, here only one's own steps).

export interface OutboxOwner { id: number; name: string }

export interface OwnedEntry {
  status: string
  tappedAt: string
  /** Who tapped it; missing on entries queued by a version of the app that did not record it. */
  owner?: OutboxOwner
}

/** What to do after a failed send: try again later, stop until someone signs in, or keep it as refused. */
export type SendOutcome = 'retry' | 'sign-in' | 'refused'

/**
 * The pending entries `me` may send now, in tap order. Another person's entries wait for that
 * person; an entry without an owner is never sent by itself (a lead adopts it first).
 */
export function sendableBy<T extends OwnedEntry>(entries: readonly T[], me: OutboxOwner | null | undefined): T[] {
  if (!me) return []
  return entries
    .filter(e => e.status === 'pending' && e.owner?.id === me.id)
    .sort((a, b) => a.tappedAt.localeCompare(b.tappedAt))
}

/** The pending entries waiting for someone else, one group per person in order of their first step. */
export function waitingForOthers<T extends OwnedEntry>(entries: readonly T[], me: OutboxOwner | null | undefined): { owner: OutboxOwner; count: number }[] {
  const groups = new Map<number, { owner: OutboxOwner; count: number }>()
  for (const e of [...entries].sort((a, b) => a.tappedAt.localeCompare(b.tappedAt))) {
    if (e.status !== 'pending' || !e.owner || e.owner.id === me?.id) continue
    const g = groups.get(e.owner.id) ?? { owner: e.owner, count: 0 }
    g.count++
    groups.set(e.owner.id, g)
  }
  return [...groups.values()]
}

/** The pending entries nobody is recorded for (queued before the outbox recorded who tapped). */
export function unowned<T extends OwnedEntry>(entries: readonly T[]): T[] {
  return entries.filter(e => e.status === 'pending' && !e.owner)
}

/**
 * A 401 means the session that was sending is over (signed out, expired, disabled, tablet
 * revoked): retrying cannot help and would only hammer the server, so sending stops until a
 * sign-in (RFC 9110 §15.5.2: the request lacks valid credentials). A network failure, 408, 429
 * and 5xx are transient (RFC 9110 §15.5.9, RFC 6585 §4, §15.6); anything else is the server's
 * answer to this step and is kept as a refusal.
 */
export function outcomeOf(status: number | undefined): SendOutcome {
  if (status === 401) return 'sign-in'
  if (!status || status >= 500 || status === 408 || status === 429) return 'retry'
  return 'refused'
}

/** "2 steps" / "1 step". */
export const stepsWord = (n: number) => `${n} step${n === 1 ? '' : 's'}`
