import { mouldsRepo } from '../../repos/moulds'
import { withLife } from '../../services/catalogue'
// Moulds with bench, state and the life warning (staff read).
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, ...STAFF)
  return (await mouldsRepo.list(useDb(), actor.workshopId)).map(withLife)
})
