// The one way a form submits: the shared zod schema checks the values in the browser, then one
// action runs behind a busy flag. Problems (the schema's, or the server's 422 `problems`) sit
// beside their fields, keyed by the field's dotted path (e.g. 'walls.0.lengthM'); `formError`
// sums them up, or carries the server's own sentence for any other refusal; `message` says what
// a success did; `refresh` reads the page's data again after a success.
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

export interface SubmitOptions {
  /** Runs after every successful action (a page's refresh, or an emit to its parent). */
  refresh?: () => unknown
  /**
   * 'fields' (default): problems beside the fields and one sentence asking to correct them;
   * 'first': the first problem as the form's message (small forms that show no field errors).
   */
  summary?: 'fields' | 'first'
}

/** The message a failed $fetch should show a person: the server's own sentence when it gave one. */
export function apiErrorMessage(err: unknown, fallback = 'Something went wrong; please try again'): string {
  const e = err as { data?: { message?: string }; statusMessage?: string; message?: string }
  return e?.data?.message || e?.statusMessage || fallback
}

/** A number input's value as a number, or null when left empty. */
export function numOrNull(v: unknown): number | null {
  if (v === '' || v === null || v === undefined) return null
  const n = Number(v)
  return Number.isNaN(n) ? (v as number) : n
}

export function useSubmit(options: SubmitOptions = {}) {
  const errors = ref<Record<string, string>>({})
  const formError = ref('')
  const message = ref('')
  const busy = ref(false)

  function clear() {
    errors.value = {}
    formError.value = ''
  }

  /** Parses `value` with `schema`; returns the data, or undefined with the problems shown. */
  function check<S extends ZodType>(schema: S, value: unknown): z.infer<S> | undefined {
    clear()
    const r = schema.safeParse(value)
    if (r.success) return r.data
    for (const issue of r.error.issues) {
      const path = issue.path.join('.')
      // the same words as the server's 422: the label the person sees, "is required" when empty
      errors.value[path || 'form'] ??= path ? inUserWords(path, issue.message, valueAt(value, issue.path), true) : issue.message
    }
    formError.value = options.summary === 'first'
      ? r.error.issues[0]?.message ?? 'Check the form'
      : 'Please correct the fields marked below.'
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

  /**
   * Runs `action` behind the busy flag (a second call while busy does nothing); on success sets
   * `message` to `done` and refreshes, on failure shows the refusal. The action's result, or
   * undefined when it failed or did not run.
   */
  async function run<T>(action: () => Promise<T>, done?: string | ((result: T) => string)): Promise<T | undefined> {
    if (busy.value) return undefined
    clear()
    message.value = ''
    busy.value = true
    try {
      const result = await action()
      if (done !== undefined) message.value = typeof done === 'string' ? done : done(result)
      await options.refresh?.()
      return result
    }
    catch (err) {
      fromServer(err)
      return undefined
    }
    finally {
      busy.value = false
    }
  }

  /** Checks `values` with `schema`, then runs `action` with the parsed data (as `run`). */
  async function submit<S extends ZodType, T>(schema: S, values: unknown, action: (data: z.infer<S>) => Promise<T>, done?: string | ((result: T) => string)): Promise<T | undefined> {
    message.value = ''
    const data = check(schema, values)
    if (data === undefined) return undefined
    return run(() => action(data), done)
  }

  return { errors, formError, message, busy, check, fromServer, clear, run, submit }
}
