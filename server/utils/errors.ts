// One way to turn bad input and database refusals into clear 4xx answers.
import type { H3Event } from 'h3'
import type { ZodType, z } from 'zod'
import { NUL_MESSAGE, fieldsWithNul } from '#shared/utils/input-fields'
import { PlasterInputError } from '#shared/utils/plaster-core'
import { fieldLabel, inUserWords, valueAt } from '#shared/utils/field-labels'

export interface FieldProblem { field: string; message: string }

/**
 * A problem in the user's words (shared/utils/field-labels.ts): the field keeps its code name,
 * for the form to put the message beside its input; the message names the label they see.
 */
function worded(p: FieldProblem): FieldProblem {
  const label = fieldLabel(p.field)
  const message = inUserWords(p.field, p.message)
  if (label === p.field || message.startsWith(label) || message.includes(label)) return { field: p.field, message }
  return { field: p.field, message: `${label} ${message}` }
}

function unprocessableError(raw: FieldProblem[]) {
  const problems = raw.map(worded)
  const first = problems[0]
  const headline = first && fieldLabel(first.field) !== first.field ? first.message : first ? `${first.field}: ${first.message}` : ''
  return createError({
    statusCode: 422,
    statusMessage: 'Unprocessable Content',
    message: headline || 'The request is not valid',
    data: { problems },
  })
}

export function unprocessable(problems: FieldProblem[]): never {
  throw unprocessableError(problems)
}

/**
 * The one place where the pure model's input errors (PlasterInputError and its
 * PlanningInputError, each naming a field) become the 422 a schema failure gets; any other
 * error comes back as it is; field paths are dotted like a schema's. server/error-handler.ts applies it to every route's error, and
 * runOnce (services/actions.ts) before it decides whether a refusal is stored, so services
 * call the model without catching.
 */
export function asHttpError(e: unknown): unknown {
  return e instanceof PlasterInputError ? unprocessableError([{ field: dottedPath(e.field), message: e.message }]) : e
}

/** The model names list members as `walls[0]`; a 422 names them as a schema does (`walls.0`). */
const dottedPath = (field: string) => field.replace(/\[(\d+)\]/g, '.$1')

function problemsOf(error: z.ZodError, value: unknown, prefix?: string): FieldProblem[] {
  return error.issues.map((i) => {
    const path = i.path.map(String).join('.')
    const field = [prefix, path].filter(Boolean).join('.') || (prefix ?? 'body')
    // an empty required field says so, in its label, rather than "must be between …"
    return { field, message: path ? inUserWords(path, i.message, valueAt(value, i.path), true) : i.message }
  })
}

/**
 * Validates with `schema` (422 naming the fields). Text with a NUL character is refused first,
 * for every body, query, path parameter and form field alike (shared/utils/input-fields.ts).
 */
export function parseOr422<S extends ZodType>(schema: S, value: unknown, prefix?: string): z.infer<S> {
  const nul = fieldsWithNul(value)
  if (nul.length) unprocessable(nul.map(f => ({ field: [prefix, f].filter(Boolean).join('.') || (prefix ?? 'body'), message: NUL_MESSAGE })))
  const r = schema.safeParse(value)
  if (!r.success) unprocessable(problemsOf(r.error, value, prefix))
  return r.data
}

/** Reads a JSON body and validates it; malformed JSON → 400, schema failure → 422 naming the field. */
export async function validBody<S extends ZodType>(event: H3Event, schema: S): Promise<z.infer<S>> {
  let body: unknown
  try {
    body = await readBody(event)
  }
  catch {
    throw createError({ statusCode: 400, message: 'The request body is not valid JSON' })
  }
  return parseOr422(schema, body ?? {}, undefined)
}

export function validParams<S extends ZodType>(event: H3Event, schema: S): z.infer<S> {
  return parseOr422(schema, getRouterParams(event, { decode: true }), 'params')
}

export function validQuery<S extends ZodType>(event: H3Event, schema: S): z.infer<S> {
  return parseOr422(schema, getQuery(event), 'query')
}

export function notFound(what: string): never {
  throw createError({ statusCode: 404, message: `${what} was not found` })
}

export function conflict(message: string, data?: Record<string, unknown>): never {
  throw createError({ statusCode: 409, message, data })
}

interface PgError { code?: string; constraint?: string; detail?: string }

/**
 * Maps PostgreSQL refusals to 409 (unique or exclusion violation) with a readable reason,
 * and foreign-key or check violations to 422; anything else is rethrown (→ 500, no detail).
 */
export function rethrowDbError(err: unknown, labels: Record<string, string> = {}): never {
  const e = err as PgError
  if (e?.code === '23505' || e?.code === '23P01') {
    conflict(labels[e.constraint ?? ''] ?? 'This conflicts with an existing record', { constraint: e.constraint })
  }
  if (e?.code === '23503') {
    unprocessable([{ field: labels[e.constraint ?? ''] ?? 'reference', message: 'refers to a record that does not exist' }])
  }
  // check violation, bad text for a type, number out of range, bad or out-of-range date/time
  if (['23514', '22P02', '22003', '22007', '22008'].includes(e?.code ?? '')) {
    unprocessable([{ field: labels[e.constraint ?? ''] ?? 'body', message: 'a value is out of its allowed range' }])
  }
  throw err
}
