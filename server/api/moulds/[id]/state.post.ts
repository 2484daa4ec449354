import { setMouldState } from '../../../services/catalogue'
// Change a mould's state with a reason (lead); who, when and why go on the mould and the register.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  const { id } = validParams(event, idParamSchema)
  const input = await validBody(event, mouldStateSchema)
  return setMouldState(actor, id, input)
})
