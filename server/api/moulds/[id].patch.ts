import { mouldsRepo } from '../../repos/moulds'
import { benchesRepo } from '../../repos/benches'
import { withLife } from '../../services/catalogue'
// Edit a mould's details (lead); its state changes through POST /api/moulds/:id/state.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  const { id } = validParams(event, idParamSchema)
  const { version, ...input } = await validBody(event, mouldPatchSchema)
  const db = useDb()
  if (input.benchId && !(await benchesRepo.byId(db, actor.workshopId, input.benchId))) unprocessable([{ field: 'benchId', message: 'benchId is not a bench of this workshop' }])
  return withLife(await mouldsRepo.update(db, actor.workshopId, id, version, input))
})
