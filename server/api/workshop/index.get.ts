// The workshop's settings (lead).
import { workshopsRepo, workshopDto } from '../../repos/workshops'

export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  const row = await workshopsRepo.get(useDb(), actor.workshopId)
  if (!row) notFound('Workshop')
  return workshopDto(row)
})
