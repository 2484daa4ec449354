// The kinds of e-mail notification a user can turn on or off (users.notify_prefs), and the
// schema of GET/PATCH /api/me/notifications. Every kind is on unless the user turned it off.
import { z } from 'zod'
import type { Role } from '#shared/types/auth'

export const NOTIFY_KINDS = ['sample_ready', 'photos_shared', 'job_ready', 'quote_sent', 'sample_decision', 'demould_overdue', 'quote_decision', 'delivery', 'invoice'] as const
export type NotifyKind = (typeof NOTIFY_KINDS)[number]

/** What each kind is about and who receives it (clients the first four, leads the last three). */
export const NOTIFY_KIND_INFO: Record<NotifyKind, { label: string; roles: Role[] }> = {
  sample_ready: { label: 'A sample cast is ready for my approval', roles: ['client'] },
  photos_shared: { label: 'New photos of my job (at most one mail per job a day)', roles: ['client'] },
  job_ready: { label: 'My job is ready for dispatch', roles: ['client'] },
  quote_sent: { label: 'A quote is waiting for my decision', roles: ['client'] },
  sample_decision: { label: 'A client approves a sample or asks for changes', roles: ['lead'] },
  quote_decision: { label: 'A client accepts a quote or asks for changes', roles: ['lead'] },
  demould_overdue: { label: 'An overdue demould (a cast past its window) or a missed start (a pour never mixed)', roles: ['lead'] },
  delivery: { label: 'A delivery of my job is booked, or signed for on site', roles: ['client'] },
  invoice: { label: 'An invoice of my job is issued (its PDF attached)', roles: ['client'] },
}

export type NotifyPrefs = Record<NotifyKind, boolean>

/** The stored jsonb (possibly partial, possibly stale keys) as one flag per kind. */
export function notifyPrefsOf(stored: unknown): NotifyPrefs {
  const s = (stored && typeof stored === 'object' ? stored : {}) as Record<string, unknown>
  return Object.fromEntries(NOTIFY_KINDS.map(k => [k, s[k] !== false])) as NotifyPrefs
}

const flag = (field: string) => z.boolean({ error: `${field} must be true or false` }).optional()
export const notifyPrefsPatchSchema = z.strictObject(
  Object.fromEntries(NOTIFY_KINDS.map(k => [k, flag(k)])) as Record<NotifyKind, ReturnType<typeof flag>>,
  { error: issue => issue.code === 'unrecognized_keys' ? `unknown notification kind: ${issue.keys.join(', ')}` : 'body must be an object' },
)
