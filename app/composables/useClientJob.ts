// A client member's job (the client job page): the job as they may see it and its progress
// (item counts, expected completion, shared photos), each under its own fetch key, and the
// words the page says about completion. Pour and piece changes reach staff rooms only, so the
// progress is read again on photo and progress events and on reconnect; `decided` reads the
// job again after the sample decision. Await it in the page's setup: both reads start at once.
export async function useClientJob(id: MaybeRefOrGetter<string | number>) {
  const jobId = String(toValue(id))
  const jobRead = useFetch(() => `/api/client/jobs/${jobId}`, { key: `client-job-${jobId}` })
  const progressRead = useFetch(() => `/api/client/jobs/${jobId}/progress`, { key: `client-progress-${jobId}` })
  const { data: job, refresh, error } = jobRead
  const { data: progress, refresh: refreshProgress } = progressRead
  // registered before the first await, while the page's setup is still current
  useLiveEvents(['photo.created', 'photo.updated', 'photo.deleted', 'job.progress'], () => refreshProgress())

  // a date only once every piece is planned, and then the day the last one should be ready to go
  const expected = computed(() => {
    const c = progress.value?.completion
    if (!c) return ''
    if (c.kind === 'ready_by') return formatDay(c.readyBy, c.timezone, c.locale)
    if (c.kind === 'all_ready') return 'every piece is ready'
    if (c.kind === 'never_dries') return 'not yet known: the workshop is checking the drying conditions'
    return c.notPlanned === c.ordered
      ? `not planned yet: none of the ${c.ordered} piece${c.ordered === 1 ? ' is' : 's are'} scheduled for casting yet`
      : `not planned yet: ${c.notPlanned} of the ${c.ordered} pieces ${c.notPlanned === 1 ? 'is' : 'are'} not scheduled for casting yet`
  })
  const readyLabel = computed(() => (progress.value?.completion.kind === 'ready_by' ? 'Ready to dispatch by' : 'Ready to dispatch'))

  /** What the page says after the client decided on the sample. */
  const thanks = ref('')
  async function decided() {
    await refresh()
    thanks.value = job.value?.sampleState === 'approved' ? 'Thank you: the sample is approved and the workshop will cast the rest.' : 'Thank you: the workshop has your comments.'
  }

  await Promise.all([jobRead, progressRead])
  return { job, progress, error, expected, readyLabel, thanks, decided }
}
