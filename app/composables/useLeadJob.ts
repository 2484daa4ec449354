// One job for the lead (/lead/jobs/:id): the job with its planned items and members under its
// own fetch key, the moulds and grades its item form offers, which form is open, the last
// message or failure, and the item delete. No live event names a job's own fields (its photos
// and dispatch panels listen for theirs), so the job is read again after each change made here.
import type { PlannedJobItem } from '#shared/types/jobs'

export async function useLeadJob(id: MaybeRefOrGetter<string | number>) {
  const jobId = String(toValue(id))
  const jobRead = useFetch(() => `/api/jobs/${jobId}`, { key: `job-${jobId}` })
  const mouldsRead = useFetch('/api/moulds', { key: 'moulds' })
  const gradesRead = useFetch('/api/grades', { key: 'grades' })
  const { data: job, refresh, error } = jobRead
  const { data: moulds } = mouldsRead
  const { data: grades } = gradesRead

  const editingJob = ref(false)
  /** The item form: closed, open for a new item, or open on the item with this id. */
  const itemForm = ref<'new' | number | null>(null)
  const message = ref('')
  const failure = ref('')
  const editedItem = computed(() => job.value?.items.find(i => i.id === itemForm.value) ?? null)
  const totals = computed(() => (job.value?.items ?? []).reduce((t, i) => ({ pieces: t.pieces + i.piecesNeeded, kg: t.kg + (i.plan.plaster?.plasterKg ?? 0) }), { pieces: 0, kg: 0 }))

  /** A change landed: say so, close the forms, read the job again. */
  async function done(text: string) {
    message.value = text
    editingJob.value = false
    itemForm.value = null
    await refresh()
  }
  async function removeItem(i: PlannedJobItem) {
    failure.value = ''
    try {
      await $fetch(`/api/jobs/${job.value!.id}/items/${i.id}`, { method: 'DELETE' })
      await done(`Removed “${i.description}”.`)
    }
    catch (err) {
      failure.value = apiErrorMessage(err)
    }
  }

  await Promise.all([jobRead, mouldsRead, gradesRead])
  return { job, moulds, grades, error, refresh, editingJob, itemForm, message, failure, editedItem, totals, done, removeItem }
}
