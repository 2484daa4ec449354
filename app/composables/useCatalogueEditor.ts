// The shared state of a lead's catalogue list page (benches, plaster grades, lots): the form
// open for a new row or an edited one, the last message or failure, and a versioned PATCH of
// one row (archive, restore) that reports what happened and refreshes the list.
export function useCatalogueEditor<Row extends { id: number; version: number }>(refresh: () => Promise<unknown>, words: { added: string; saved: string }) {
  const editing = ref<Row | null>(null) as Ref<Row | null>
  const creating = ref(false)
  const message = ref('')
  const failure = ref('')

  /** The form saved: say so, close it, read the list again. */
  async function saved() {
    message.value = editing.value ? words.saved : words.added
    editing.value = null
    creating.value = false
    await refresh()
  }

  /** PATCHes `url` with the row's version (409 when someone else changed it) and says `done`. */
  async function patch(url: string, row: Row, body: Record<string, unknown>, done: string) {
    failure.value = ''
    try {
      await $fetch(url, { method: 'PATCH', body: { ...body, version: row.version } })
      message.value = done
      await refresh()
    }
    catch (err) {
      failure.value = apiErrorMessage(err)
    }
  }

  return { editing, creating, message, failure, saved, patch }
}
