// A form that checks its values with the shared zod schema, then runs one action: the first
// problem (browser or server) as one message, and a busy flag for the button.
import type { ZodType, z } from 'zod'

export function useSchemaSubmit<S extends ZodType>(schema: S, action: (data: z.infer<S>) => Promise<void>) {
  const error = ref('')
  const busy = ref(false)
  async function submit(values: unknown) {
    error.value = ''
    const parsed = schema.safeParse(values)
    if (!parsed.success) {
      error.value = parsed.error.issues[0]?.message ?? 'Check the form'
      return
    }
    busy.value = true
    try {
      await action(parsed.data)
    }
    catch (err) {
      error.value = apiErrorMessage(err)
    }
    finally {
      busy.value = false
    }
  }
  return { error, busy, submit }
}
