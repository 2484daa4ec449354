import { createGrade } from '../../services/catalogue'
// A new plaster grade, usually copied from a preset and edited (lead).
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  const input = await validBody(event, gradeCreateSchema)
  const grade = await createGrade(actor.workshopId, input)
  setResponseStatus(event, 201)
  return grade
})
