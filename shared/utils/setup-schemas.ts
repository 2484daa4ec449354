// First-run set-up (the /setup page and POST /api/setup): the one-time code printed on the
// server's console, the workshop's settings, and its first lead.
import { z } from 'zod'
import { checkCrateMax, checkShiftBreaks, workshopFields } from './workshop-schemas'
import { PASSWORD_MIN } from './auth-schemas'

/** Code letters without 0/O and 1/I/L, so a code read off a console is typed right. */
export const SETUP_CODE_ALPHABET = 'ABCDEFGHJKMNPQRSTUVWXYZ23456789'

/** The code as typed: spaces and dashes dropped, letters upper-cased. */
export function normalizeSetupCode(code: string) {
  return code.replace(/[\s-]/g, '').toUpperCase()
}

export const setupSchema = z.object({
  code: z.string({ error: 'Set-up code is required' }).max(64, { error: 'Set-up code is the code printed on the server console' })
    .transform(normalizeSetupCode)
    .pipe(z.string().regex(/^[A-Z0-9]{12}$/, { error: 'Set-up code is the 12 letters and digits printed on the server console' })),
  ...workshopFields,
  leadName: z.string({ error: 'Your name is required' }).trim().min(1, { error: 'Your name is required' }).max(120, { error: 'Your name must be at most 120 characters' }),
  leadEmail: z.string({ error: 'Your e-mail is required' }).trim().toLowerCase().max(254, { error: 'Your e-mail is too long' })
    .pipe(z.email({ error: 'Your e-mail must be an e-mail address' })),
  leadPassword: z.string({ error: 'Password is required' }).min(PASSWORD_MIN, { error: `Password must be at least ${PASSWORD_MIN} characters` })
    .max(200, { error: 'Password must be at most 200 characters' }),
}).refine(v => v.shiftStart < v.shiftEnd, { path: ['shiftEnd'], error: 'shiftEnd must be after shiftStart' })
  .superRefine(checkShiftBreaks)
  .superRefine(checkCrateMax)

export type SetupInput = z.infer<typeof setupSchema>
