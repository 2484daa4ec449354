import { mouldsRepo } from '../../repos/moulds'
import { benchesRepo } from '../../repos/benches'
import { withLife } from '../../services/catalogue'
// A new mould (lead). A duplicate code is a 409.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  const input = await validBody(event, mouldCreateSchema)
  const db = useDb()
  if (input.benchId && !(await benchesRepo.byId(db, actor.workshopId, input.benchId))) unprocessable([{ field: 'benchId', message: 'benchId is not a bench of this workshop' }])
  const row = await mouldsRepo.insert(db, actor.workshopId, actor.id, input)
  setResponseStatus(event, 201)
  return withLife(row)
})
