import { lotsRepo } from '../../repos/plaster-lots'
import { gradesRepo } from '../../repos/plaster-grades'
// Receive a delivery of plaster (lead).
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  const input = await validBody(event, lotCreateSchema)
  const db = useDb()
  if (!(await gradesRepo.byId(db, actor.workshopId, input.gradeId))) unprocessable([{ field: 'gradeId', message: 'gradeId is not a plaster grade of this workshop' }])
  const row = await lotsRepo.insert(db, actor.workshopId, input)
  setResponseStatus(event, 201)
  return row
})
