// The copies a device keeps for working offline that show a person's data: the service
// worker's copies of the tablet pages (their HTML carries the signed-in person) and the pages'
// cached cards (the outbox's cache). Cleared at sign-out so the next person on the device
// never opens the previous one's day. The precached app files (scripts, styles, icons) hold
// nobody's data and stay; the outbox's waiting steps stay for the person who took them.
export const OFFLINE_PAGE_CACHES = ['setline-pages']

export async function clearOfflineCopies(clearCards: () => Promise<void>) {
  const jobs: Promise<unknown>[] = [clearCards()]
  if (typeof caches !== 'undefined') jobs.push(...OFFLINE_PAGE_CACHES.map(name => caches.delete(name)))
  await Promise.allSettled(jobs)
}
