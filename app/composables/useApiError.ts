// The message a failed $fetch should show a person: the server's own sentence when it gave one.
export function apiErrorMessage(err: unknown, fallback = 'Something went wrong; please try again'): string {
  const e = err as { data?: { message?: string }; statusMessage?: string; message?: string }
  return e?.data?.message || e?.statusMessage || fallback
}
