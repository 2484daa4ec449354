// The lead's list of jobs (/lead/jobs): every job of the workshop under one fetch key, and the
// state filter with each row's words for its state and sample. No live event names a job's
// own fields, so the list is read when the page opens.
export async function useLeadJobs() {
  const read = useFetch('/api/jobs', { key: 'jobs' })
  const { data: jobs, error } = read
  const stateFilter = ref('open')
  const rows = computed(() => (jobs.value ?? []).filter(j => !stateFilter.value || j.state === stateFilter.value)
    .map(j => ({ ...j, stateLabel: JOB_STATE_LABELS[j.state as keyof typeof JOB_STATE_LABELS], sampleLabel: SAMPLE_STATE_LABELS[j.sampleState as keyof typeof SAMPLE_STATE_LABELS] })))
  await read
  return { jobs, error, stateFilter, rows }
}
