// Field errors for a form, from the shared zod schema in the browser and from the server's
// 422 problems, keyed by the field's dotted path (e.g. 'walls.0.lengthM').
import type { ZodType, z } from 'zod'
import { inUserWords, valueAt } from '#shared/utils/field-labels'

/**
 * After a refusal, focus goes to the first field marked wrong (UiField's `<id>-error` names its
 * input), else to the message on top: a keyboard or screen-reader user lands on the problem,
 * not on <body>.
 */
async function focusFirstProblem() {
  if (!import.meta.client) return
  await nextTick()
  const error = document.querySelector<HTMLElement>('[id$="-error"][role="alert"]')
  const field = error ? document.getElementById(error.id.slice(0, -'-error'.length)) : null
  if (field) return field.focus()
  const message = document.querySelector<HTMLElement>('.notice-error[role="alert"]')
  if (message) {
    message.tabIndex = -1
    message.focus()
  }
}

export function useFormErrors() {
  const errors = ref<Record<string, string>>({})
  const formError = ref('')

  /** Parses `value` with `schema`; returns the data, or undefined with errors set. */
  function check<S extends ZodType>(schema: S, value: unknown): z.infer<S> | undefined {
    errors.value = {}
    formError.value = ''
    const r = schema.safeParse(value)
    if (r.success) return r.data
    for (const issue of r.error.issues) {
      const path = issue.path.join('.')
      // the same words as the server's 422: the label the person sees, "is required" when empty
      errors.value[path || 'form'] ??= path ? inUserWords(path, issue.message, valueAt(value, issue.path), true) : issue.message
    }
    formError.value = 'Please correct the fields marked below.'
    void focusFirstProblem()
    return undefined
  }

  /** Shows a failed $fetch: the server's field problems beside the fields, its message on top. */
  function fromServer(err: unknown) {
    const problems = (err as { data?: { data?: { problems?: { field: string; message: string }[] } } })?.data?.data?.problems
    for (const p of problems ?? []) errors.value[p.field] = p.message
    formError.value = apiErrorMessage(err)
    void focusFirstProblem()
  }

  function clear() {
    errors.value = {}
    formError.value = ''
  }

  return { errors, formError, check, fromServer, clear }
}

/** A number input's value as a number, or null when left empty. */
export function numOrNull(v: unknown): number | null {
  if (v === '' || v === null || v === undefined) return null
  const n = Number(v)
  return Number.isNaN(n) ? (v as number) : n
}
