import { gradesRepo } from '../../repos/plaster-grades'
// A new plaster grade, usually copied from a preset and edited (lead).
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  const input = await validBody(event, gradeCreateSchema)
  const row = await gradesRepo.insert(useDb(), actor.workshopId, input)
  setResponseStatus(event, 201)
  return row
})
