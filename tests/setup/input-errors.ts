// The pure model's input errors in unit tests: which field a refusal names.
import { expect } from 'vitest'

type FieldError = abstract new (...args: never[]) => { field: string }

/**
 * The field named by the error `fn` throws, after checking the error is each of `kinds` (the
 * model's error class; the routes map it to a 422 naming that field); undefined when `fn` returns.
 */
export function inputErrorField(fn: () => unknown, ...kinds: [FieldError, ...FieldError[]]): string | undefined {
  try {
    fn()
  }
  catch (e) {
    for (const kind of kinds) expect(e).toBeInstanceOf(kind)
    return (e as { field: string }).field
  }
  return undefined
}
