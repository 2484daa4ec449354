// Zod schema of a scanned label's token (GET /api/labels/:token), and the token's shape the
// tablet's scanner checks too (shared/utils/piece-labels.ts).
import { z } from 'zod'

/** A label token: 16 random bytes in base64url (22 characters), short enough for a small QR code. */
export const LABEL_TOKEN_PATTERN = /^[\w-]{22}$/

const NOT_A_LABEL = 'The scanned code is not a Setline label: it opens nothing'
export const labelTokenParamSchema = z.object({
  token: z.string({ error: NOT_A_LABEL }).regex(LABEL_TOKEN_PATTERN, { error: NOT_A_LABEL }),
})
