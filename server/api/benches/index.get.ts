import { benchesRepo } from '../../repos/benches'
// Benches in board order (staff read).
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, ...STAFF)
  return benchesRepo.list(useDb(), actor.workshopId)
})
