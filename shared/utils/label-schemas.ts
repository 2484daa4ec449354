// Zod schema of a scanned label's token (GET /api/labels/:token), and the token's shape the
// tablet's scanner checks too (LABEL_TOKEN_PATTERN, shared/utils/piece-labels.ts).
import { z } from 'zod'
import { LABEL_TOKEN_PATTERN } from './piece-labels'

const NOT_A_LABEL = 'The scanned code is not a Setline label: it opens nothing'
export const labelTokenParamSchema = z.object({
  token: z.string({ error: NOT_A_LABEL }).regex(LABEL_TOKEN_PATTERN, { error: NOT_A_LABEL }),
})
