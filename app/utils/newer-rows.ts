// A tablet page reads its list again on every live event, while the outbox hands it the answers
// of its own steps: a read that left before a step was committed can come back after that
// step's answer. Each row keeps the newer of the two versions, so a late read never moves a
// card back a step.

/** `fresh`, with any row `held` has at a higher version kept as held. */
export function keepNewerRows<T>(held: readonly T[] | undefined, fresh: T[], idOf: (row: T) => number, versionOf: (row: T) => number): T[] {
  if (!held?.length) return fresh
  const byId = new Map(held.map(r => [idOf(r), r]))
  return fresh.map((r) => {
    const h = byId.get(idOf(r))
    return h && versionOf(h) > versionOf(r) ? h : r
  })
}
