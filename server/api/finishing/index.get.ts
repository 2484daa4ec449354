import { finishingQueue } from '../../queries/finishing-queue'
// The finisher's queue: pieces to fettle (most urgent job first, then oldest), in repair,
// drying (with dry-by and the last weighing), ready and packed.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'finisher', 'lead')
  return finishingQueue(actor)
})
