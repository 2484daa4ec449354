// The schema of the development mail routes (lead, only with the SMTP fake).
import { z } from 'zod'

const COUNT_MESSAGE = 'count must be a whole number from 0 to 100'

/** POST /api/dev/mails/refuse: how many of the next messages the SMTP fake refuses. */
export const devMailRefuseSchema = z.object({
  count: z.number({ error: COUNT_MESSAGE }).int({ error: COUNT_MESSAGE }).min(0, { error: COUNT_MESSAGE }).max(100, { error: COUNT_MESSAGE }),
})
