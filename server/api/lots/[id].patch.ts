import { lotsRepo } from '../../repos/plaster-lots'
import { gradesRepo } from '../../repos/plaster-grades'
// Correct or archive a lot (lead); the body names the version it saw.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  const { id } = validParams(event, idParamSchema)
  const { version, ...input } = await validBody(event, lotPatchSchema)
  const db = useDb()
  if (input.gradeId && !(await gradesRepo.byId(db, actor.workshopId, input.gradeId))) unprocessable([{ field: 'gradeId', message: 'gradeId is not a plaster grade of this workshop' }])
  return lotsRepo.update(db, actor.workshopId, id, version, input)
})
