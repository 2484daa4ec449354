// A job's cost against its estimate for the lead (GET /api/jobs/:id/cost): its fetch key, its data
// and its live events. A pour or piece of this job moving on (mixing, demoulding, a finisher's
// clock started or stopped) reads the cost again, so the lead watches it grow as the job runs.
// Only staff sockets carry pour and piece events; the client's job room never hears of costs.
export async function useJobCost(jobId: MaybeRefOrGetter<number>) {
  const id = toValue(jobId)
  const read = useFetch(() => `/api/jobs/${id}/cost`, { key: `job-cost-${id}` })
  let again = false
  let reading: Promise<void> | null = null
  /** One read at a time; events during a read ask for one more after it. */
  function refreshSoon() {
    if (reading) {
      again = true
      return
    }
    reading = read.refresh().finally(() => {
      reading = null
      if (again) {
        again = false
        refreshSoon()
      }
    })
  }
  useLiveEvents(['pour.updated', 'pour.voided', 'piece.updated'], (e) => {
    if (e.type === 'catch-up') return refreshSoon()
    // a pour event's member names three types at once, so Extract cannot narrow to it: read the row's job
    const row = (e as { row?: { jobId?: number | null; job?: { id: number } | null } }).row
    const ofJob = row?.job?.id ?? row?.jobId
    if (ofJob === id) refreshSoon()
  })
  await read
  return { cost: read.data, error: read.error, refresh: read.refresh }
}
